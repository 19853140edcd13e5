import { useState } from 'react';
import { QueryClient, QueryClientProvider, useQuery, useQueryClient } from '@tanstack/react-query';
import { formatQuantity } from '@/lib/units';
import { cancelRun, fetchRun, retryRun } from './api';
import { shortId } from './format';
import { useRunEvents } from './hooks';
import { hasPlots, ProbePlots } from './ProbePlots';
import { ReadoutsTable } from './ReadoutsTable';
import { RunExports } from './RunExports';
import { RunStatusPanel } from './RunStatusPanel';
import { isActive, type Run } from './types';

export interface RunDetailProps {
  /** The run as the server rendered the page (with its summary once succeeded). */
  initialRun: Run;
}

/**
 * The run page island: live status over server-sent events while the run is queued or running,
 * then each probe's plots, the readouts and the exports. Client only (Plotly needs a browser).
 */
export default function RunDetail(props: RunDetailProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } }));
  return (
    <QueryClientProvider client={client}>
      <RunDetailBody {...props} />
    </QueryClientProvider>
  );
}

// Safety net under the event stream (a proxy that buffers it, a dropped connection): re-read the
// run now and then while it is active.
const ACTIVE_REFRESH_MS = 5_000;

function RunDetailBody({ initialRun }: RunDetailProps) {
  const id = initialRun.id;
  const queryClient = useQueryClient();
  const query = useQuery({
    queryKey: ['run', id],
    queryFn: () => fetchRun(id),
    initialData: initialRun,
    // A finished run does not change: the rendered one is as good as a fresh answer.
    staleTime: (q) => (q.state.data && isActive(q.state.data.status) ? 0 : Infinity),
    refetchInterval: (q) => (q.state.data && isActive(q.state.data.status) ? ACTIVE_REFRESH_MS : false),
  });
  const run = query.data ?? initialRun;
  useRunEvents(id, isActive(run.status));
  const [busy, setBusy] = useState(false);
  const [actionError, setActionError] = useState<string | null>(null);

  async function cancel() {
    setBusy(true);
    setActionError(null);
    const result = await cancelRun(id);
    setBusy(false);
    if (!result.ok) return setActionError(`The run could not be cancelled: ${result.error.message}`);
    queryClient.setQueryData(['run', id], result.data);
    await queryClient.invalidateQueries({ queryKey: ['run', id] });
  }

  async function retry() {
    setBusy(true);
    setActionError(null);
    const result = await retryRun(id);
    if (!result.ok) {
      setBusy(false);
      return setActionError(`The run could not be retried: ${result.error.message}`);
    }
    window.location.assign(`/runs/${result.data.runs[0].id}`);
  }

  const summary = run.status === 'succeeded' ? run.summary : undefined;
  const fileBase = `run-${shortId(id)}`;
  const plotted = summary?.testPoints.filter(hasPlots) ?? [];

  return (
    <div className="space-y-6" data-testid="run-detail">
      <RunStatusPanel run={run} busy={busy} onCancel={() => void cancel()} onRetry={() => void retry()} actionError={actionError} />
      {query.isError && (
        <p role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          The run could not be reloaded: {(query.error as Error).message}
        </p>
      )}
      {run.status === 'succeeded' && !summary && <p className="text-sm text-muted">Loading the results…</p>}
      {isActive(run.status) && (
        <p className="rounded-lg border border-dashed border-line bg-panel px-5 py-8 text-center text-sm text-muted">
          The plots of each probe, the readouts and the exports appear here when the run has finished.
        </p>
      )}
      {summary && (
        <div className="grid items-start gap-6 2xl:grid-cols-[minmax(0,1fr)_30rem]">
          <div className="min-w-0 space-y-6">
            {plotted.length === 0 && (
              <p className="rounded-lg border border-dashed border-line bg-panel p-6 text-sm text-muted">
                No probe of this chain keeps a spectrum, a spectrogram or a trace.
              </p>
            )}
            {plotted.map((probe) => (
              <section key={probe.stageId} aria-labelledby={`probe-${probe.stageId}`} className="space-y-3">
                <h2 id={`probe-${probe.stageId}`} className="flex flex-wrap items-baseline gap-x-3 text-lg font-semibold">
                  Probe <span className="font-mono text-base">{probe.stageId}</span>
                  <span className="text-sm font-normal text-muted">
                    {probe.kind} stage · {probe.format.sampleType} output at {formatQuantity(probe.format.sampleRate, 'sps')}
                  </span>
                </h2>
                <ProbePlots runId={id} probe={probe} fileBase={fileBase} />
              </section>
            ))}
          </div>
          <div className="grid items-start gap-6 xl:grid-cols-[minmax(0,1fr)_24rem] 2xl:sticky 2xl:top-20 2xl:grid-cols-1">
            <section aria-labelledby="readouts-title" className="rounded-lg border border-line bg-panel p-4">
              <h2 id="readouts-title" className="mb-2 font-semibold">
                Readouts
              </h2>
              <ReadoutsTable testPoints={summary.testPoints} />
            </section>
            <RunExports runId={id} summary={summary} />
          </div>
        </div>
      )}
    </div>
  );
}
