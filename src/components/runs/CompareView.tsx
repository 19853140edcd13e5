import { useMemo, useState } from 'react';
import { QueryClient, QueryClientProvider, keepPreviousData, useQuery } from '@tanstack/react-query';
import Plot, { PlotPlaceholder } from '../plots/Plot';
import { usePlotTheme } from '../plots/plot-theme';
import { fetchComparison } from './api';
import { CompareReadouts } from './CompareReadouts';
import { overlayFigure, runColour } from './compare-figures';
import { shortId } from './format';
import { usePlotWidth } from './hooks';
import { PlotCard, plotConfig } from './PlotCard';
import { StatusBadge } from './StatusBadge';
import { isActive, type ComparedSpectrum, type Run, type RunComparison } from './types';

export interface CompareViewProps {
  /** Run ids in the order asked; the first is the baseline of the differences. */
  ids: string[];
}

/** The comparison island: overlaid spectra and readouts side by side. Client only (Plotly). */
export default function CompareView(props: CompareViewProps) {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { retry: 1, refetchOnWindowFocus: false } } }));
  return (
    <QueryClientProvider client={client}>
      <CompareBody {...props} />
    </QueryClientProvider>
  );
}

const HEIGHT = 380;

function CompareBody({ ids }: CompareViewProps) {
  // The spectra cards sit inside this box, their padding and border (2 x 17 px) inside it.
  const [box, width] = usePlotWidth<HTMLDivElement>(34);
  const query = useQuery({
    queryKey: ['compare', ids, width],
    queryFn: () => fetchComparison(ids, width),
    enabled: width > 0,
    placeholderData: keepPreviousData,
    // A compared run still queued or running joins the plot and the table when it finishes.
    refetchInterval: (q) => (q.state.data?.runs.some((run) => isActive(run.status)) ? 3_000 : false),
  });
  const comparison = query.data;
  return (
    <div className="space-y-6" data-testid="compare-view">
      {query.isError && (
        <p role="alert" className="rounded-md border border-danger/40 bg-danger/10 px-3 py-2 text-sm text-danger">
          The comparison could not be loaded: {(query.error as Error).message}{' '}
          <a className="underline" href="/runs">
            Back to the runs
          </a>
        </p>
      )}
      {comparison && <RunLegend runs={comparison.runs} />}
      {/* Wide screens put the readouts beside the spectra rather than stretching the table across. */}
      <div className="grid items-start gap-6 2xl:grid-cols-[minmax(0,1fr)_minmax(0,56rem)]">
        <div ref={box} className="min-w-0 space-y-6">
          {comparison ? <SpectraOverlays comparison={comparison} /> : !query.isError && <PlotPlaceholder height={HEIGHT} text="Loading the runs…" />}
        </div>
        {/* Always present, so the spectra column keeps its width (and its fetched width) when the data arrive. */}
        <section aria-labelledby="compare-readouts-title" className="min-w-0 rounded-lg border border-line bg-panel p-4">
          <div className="mb-3 space-y-0.5">
            <h2 id="compare-readouts-title" className="font-semibold">
              Readouts side by side
            </h2>
            <p className="text-xs text-muted">
              Δ against the first run
              {comparison && (
                <>
                  , <span className="font-medium text-ink">{comparison.runs[0]?.capture.name}</span>
                </>
              )}
              ; marked when 1 dB or more for levels, 10 % or more otherwise.
            </p>
          </div>
          {comparison ? <CompareReadouts comparison={comparison} /> : <p className="text-sm text-muted">Loading…</p>}
        </section>
      </div>
    </div>
  );
}

/** The compared runs with their trace colours, status and a link to each. */
function RunLegend({ runs }: { runs: Run[] }) {
  const theme = usePlotTheme();
  return (
    <ol className="grid gap-2 md:grid-cols-2 2xl:grid-cols-4" aria-label="Compared runs">
      {runs.map((run, index) => (
        <li key={run.id} className="flex min-w-0 items-start gap-3 rounded-lg border border-line bg-panel px-3 py-2.5" data-compare-run={run.id}>
          <span aria-hidden="true" className="mt-1.5 h-1 w-5 shrink-0 rounded-full" style={{ background: runColour(theme, index) }} />
          <div className="min-w-0 text-sm">
            <a className="block truncate font-medium text-ink hover:text-accent hover:underline" href={`/runs/${run.id}`} title={run.capture.name}>
              {run.capture.name}
            </a>
            <p className="truncate text-xs text-muted">
              {run.chain.name} <span className="font-mono">r{run.chain.revision}</span> · <span className="font-mono">{shortId(run.id)}</span>
              {index === 0 && ' · baseline'}
            </p>
            {run.status !== 'succeeded' && (
              <p className="mt-1 flex items-center gap-2 text-xs text-muted">
                <StatusBadge status={run.status} /> no results to compare
              </p>
            )}
          </div>
        </li>
      ))}
    </ol>
  );
}

/** One plot per probe that has a spectrum, every run's spectrum of that probe overlaid. */
function SpectraOverlays({ comparison }: { comparison: RunComparison }) {
  const theme = usePlotTheme();
  const byProbe = useMemo(() => {
    const groups = new Map<string, ComparedSpectrum[]>();
    for (const spectrum of comparison.spectra) groups.set(spectrum.probe, [...(groups.get(spectrum.probe) ?? []), spectrum]);
    return [...groups.entries()];
  }, [comparison.spectra]);
  if (byProbe.length === 0) {
    return <p className="rounded-lg border border-dashed border-line bg-panel p-6 text-sm text-muted">None of these runs has a spectrum to overlay.</p>;
  }
  return (
    <>
      {byProbe.map(([probe, spectra]) => (
        <OverlayCard key={probe} probe={probe} spectra={spectra} runs={comparison.runs} theme={theme} />
      ))}
    </>
  );
}

function OverlayCard({ probe, spectra, runs, theme }: { probe: string; spectra: ComparedSpectrum[]; runs: Run[]; theme: ReturnType<typeof usePlotTheme> }) {
  const [graph, setGraph] = useState<HTMLElement | null>(null);
  const figure = useMemo(() => overlayFigure(spectra, runs, theme), [spectra, runs, theme]);
  const points = Math.max(...spectra.map((s) => s.frequencies.length));
  return (
    <PlotCard
      title={`Spectra at ${probe}`}
      note={`${spectra.length} ${spectra.length === 1 ? 'run' : 'runs'} overlaid · up to ${points.toLocaleString('en')} points each · frequency from each stream's centre`}
      graph={graph}
      fileName={`compare-spectra-${probe}`}
      testId={`compare-spectra-${probe}`}
    >
      <Plot
        label={`Spectra at ${probe}, overlaid`}
        testId={`compare-plot-${probe}`}
        height={HEIGHT}
        data={figure.data}
        layout={figure.layout}
        config={plotConfig}
        onReady={setGraph}
      />
    </PlotCard>
  );
}
