import { useEffect, useMemo, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { buttonPrimary } from '../ui';
import { ServerTableView } from '../table/ServerTableView';
import { TableNotice } from '../table/TableNotice';
import { useServerTable } from '../table/useServerTable';
import { useUrlState } from '../table/useUrlState';
import { withQueryClient } from '../table/withQueryClient';
import { cancelRun, fetchRunList, retryRun } from './api';
import { shortId } from './format';
import { useClock } from './hooks';
import { RUN_PAGE_SIZES, runListCodec, runListParams, STATUS_FILTERS, type RunListState } from './list-state';
import { runColumns } from './run-columns';
import { isActive, type Run, type RunList } from './types';

export interface RunsTableProps {
  /** The list state the page's URL asked for (parsed on the server with the same codec). */
  initialState: RunListState;
  /** The page of runs the server rendered for that state, shown before any request. */
  initialList: RunList;
  /** Admins may switch to the whole queue (every user's runs). */
  canSeeQueue: boolean;
}

// The list is polled while a run is queued or running, rather than one event stream per run:
// a browser keeps at most six connections per host, and a busy queue would use them all up.
const ACTIVE_POLL_MS = 1_000;

/** The runs list island: status filter, queue switch and page live in the URL. */
function RunsTable({ initialState, initialList, canSeeQueue }: RunsTableProps) {
  const queryClient = useQueryClient();
  const codec = useMemo(() => runListCodec(canSeeQueue), [canSeeQueue]);
  const urlState = useUrlState(codec, initialState);
  const { state, settled, update } = urlState;
  const [busyId, setBusyId] = useState<string | null>(null);
  const [notice, setNotice] = useState<{ tone: 'ok' | 'error'; text: string; href?: string } | null>(null);
  // Durations of running runs tick each second; the page on screen says whether any is running.
  const [anyRunning, setAnyRunning] = useState(() => initialList.runs.some((run) => run.status === 'running'));
  const now = useClock(anyRunning);

  async function act(run: Run, action: 'cancel' | 'retry') {
    setBusyId(run.id);
    setNotice(null);
    if (action === 'cancel') {
      const result = await cancelRun(run.id);
      if (!result.ok) setNotice({ tone: 'error', text: `The run could not be cancelled: ${result.error.message}` });
      else setNotice({ tone: 'ok', text: `Cancelled the run of ${run.chain.name} on ${run.capture.name}.` });
    } else {
      const result = await retryRun(run.id);
      if (!result.ok) setNotice({ tone: 'error', text: `The run could not be retried: ${result.error.message}` });
      else {
        const next = result.data.runs[0];
        setNotice({ tone: 'ok', text: `Retrying ${run.chain.name} on ${run.capture.name} as run ${shortId(next.id)}.`, href: `/runs/${next.id}` });
      }
    }
    setBusyId(null);
    await queryClient.invalidateQueries({ queryKey: ['runs'] });
  }

  const columns = useMemo(
    () => runColumns({ onCancel: (run) => void act(run, 'cancel'), onRetry: (run) => void act(run, 'retry'), busyId, now }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [busyId, now],
  );

  const { list, selected, clearSelection, view } = useServerTable({
    queryKey: 'runs',
    urlState,
    initialState,
    initialList,
    toParams: runListParams,
    fetchList: fetchRunList,
    rowsOf: (page: RunList) => page.runs,
    columns,
    getRowId: (run) => run.id,
    canSelect: (run) => run.status === 'succeeded',
    // A comparison may gather runs from several pages, and live updates must not drop them.
    selectionAcrossPages: true,
    refetchInterval: (page) => (page?.runs.some((run) => isActive(run.status)) ? ACTIVE_POLL_MS : false),
  });
  useEffect(() => setAnyRunning(list.runs.some((run) => run.status === 'running')), [list]);

  const compareHref = `/runs/compare?ids=${selected.map((run) => encodeURIComponent(run.id)).join(',')}`;
  const active = list.runs.filter((run) => isActive(run.status)).length;

  return (
    <section aria-label="Runs" className="space-y-4" data-testid="runs-table" data-active-runs={active}>
      <div className="flex flex-wrap items-center gap-x-6 gap-y-3 rounded-lg border border-line bg-panel px-4 py-3">
        <label className="flex items-center gap-2 text-sm">
          <span className="text-muted">Show</span>
          <select
            className="rounded border border-muted/40 bg-surface px-2 py-1 text-sm text-ink"
            value={state.status}
            onChange={(e) => update((current) => ({ ...current, status: e.target.value, page: 1 }), 'push')}
          >
            {STATUS_FILTERS.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label}
              </option>
            ))}
          </select>
        </label>
        {canSeeQueue && (
          <label className="flex items-center gap-2 text-sm" title="Admins see every user's runs, private ones with their names withheld">
            <input
              type="checkbox"
              className="h-4 w-4 accent-[rgb(var(--q-accent))]"
              checked={state.all}
              onChange={(e) => update((current) => ({ ...current, all: e.target.checked, page: 1 }), 'push')}
            />
            All users (the whole queue)
          </label>
        )}
        <p className="text-sm text-muted" aria-live="polite">
          {active > 0 ? (
            <>
              <span className="font-mono tabular-nums text-ink">{active}</span> {active === 1 ? 'run' : 'runs'} queued or running, updating live
            </>
          ) : (
            'No run in progress on this page'
          )}
        </p>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <span className="text-muted" aria-live="polite">
            {selected.length > 0 ? `${selected.length} selected` : 'Select two or more succeeded runs to compare them'}
          </span>
          {selected.length > 0 && (
            <button
              type="button"
              className="text-xs text-muted underline hover:text-ink"
              onClick={clearSelection}
            >
              Clear
            </button>
          )}
          {selected.length >= 2 && selected.length <= 10 ? (
            <a className={buttonPrimary} href={compareHref} data-testid="compare-selected">
              Compare {selected.length} runs
            </a>
          ) : (
            <button
              type="button"
              className={buttonPrimary}
              disabled
              title={selected.length > 10 ? 'Compare at most ten runs at once' : 'Select at least two runs'}
            >
              Compare
            </button>
          )}
        </div>
      </div>

      {notice && (
        <TableNotice tone={notice.tone} onDismiss={() => setNotice(null)}>
          {notice.text}{' '}
          {notice.href && (
            <a className="underline" href={notice.href}>
              Open it
            </a>
          )}
        </TableNotice>
      )}

      <ServerTableView
        {...view}
        noun="runs"
        caption="Runs, newest first"
        empty={
          settled.status ? 'No run has this status.' : 'No runs yet. Open a chain and choose “Run on captures…”, or open a capture and run a chain on it.'
        }
        pageSizes={RUN_PAGE_SIZES}
        cellPadding="px-3 py-2"
        cellAlign="middle"
        rowAttributes={(run) => ({ 'data-run-id': run.id, 'data-status': run.status })}
      />
    </section>
  );
}

export default withQueryClient(RunsTable, 2_000);
