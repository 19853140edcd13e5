/**
 * All plots of one probe: its spectrum (with markers), spectrogram, I and Q against time and, for
 * complex output, its constellation. Each plot fetches data reduced to its own width.
 */
import { useMemo, useState } from 'react';
import Plot, { PlotPlaceholder } from '../plots/Plot';
import { usePlotTheme } from '../plots/plot-theme';
import { usePlotData, usePlotWidth } from './hooks';
import { PlotCard, plotConfig } from './PlotCard';
import { constellationFigure, frequencyAxis, spectrogramFigure, traceFigure } from './run-figures';
import { SpectrumCard } from './SpectrumCard';
import type { TestPoint } from './types';

const HEIGHT = 300;

/** True when the test point has anything to plot (not only readouts). */
export function hasPlots(probe: TestPoint): boolean {
  return probe.plots.length > 0;
}

export function ProbePlots({ runId, probe, fileBase }: { runId: string; probe: TestPoint; fileBase: string }) {
  const spectrum = probe.spectrum;
  const others = probe.plots.filter((kind): kind is OtherKind => kind !== 'spectrum');
  return (
    <div className="space-y-4" data-probe={probe.stageId}>
      {spectrum && <SpectrumCard runId={runId} probe={{ ...probe, spectrum }} fileBase={fileBase} />}
      {others.length > 0 && (
        <div className={'grid gap-4 ' + (others.length > 1 ? 'xl:grid-cols-2' : '')}>
          {others.map((kind) => (
            <OtherPlotCard key={kind} runId={runId} probe={probe} kind={kind} fileBase={fileBase} />
          ))}
        </div>
      )}
    </div>
  );
}

type OtherKind = 'spectrogram' | 'trace' | 'constellation';

const TITLES: Record<OtherKind, (probe: TestPoint) => string> = {
  spectrogram: (p) => `Spectrogram at ${p.stageId}`,
  trace: (p) => (p.format.sampleType === 'real' ? `Signal against time at ${p.stageId}` : `I and Q against time at ${p.stageId}`),
  constellation: (p) => `Constellation at ${p.stageId}`,
};

function OtherPlotCard({ runId, probe, kind, fileBase }: { runId: string; probe: TestPoint; kind: OtherKind; fileBase: string }) {
  const theme = usePlotTheme();
  const [box, width] = usePlotWidth<HTMLDivElement>();
  // A scatter of points covers an area: its pixel budget is the plot's area, and eight points per
  // column stays far below it, where one per column would thin a constellation out to a few hundred.
  const points = kind === 'constellation' ? Math.min(10_000, width * 8) : width;
  const plot = usePlotData(runId, probe.stageId, kind, points);
  const [graph, setGraph] = useState<HTMLElement | null>(null);
  const figure = useMemo(() => {
    const data = plot.data;
    if (!data) return null;
    if (data.kind === 'spectrogram') {
      const f = data.frequencies;
      return spectrogramFigure(data, frequencyAxis(probe.format, f[0] ?? 0, f[f.length - 1] ?? 1), theme);
    }
    if (data.kind === 'trace') return traceFigure(data, theme);
    if (data.kind === 'constellation') return constellationFigure(data, theme);
    return null;
  }, [plot.data, probe.format, theme]);
  const note = useMemo(() => {
    const data = plot.data;
    if (!data) return undefined;
    if (data.kind === 'spectrogram') return `${data.times.length} rows × ${data.frequencies.length} columns`;
    if (data.kind === 'trace')
      return data.samplesPerColumn > 1 ? `min/max of ${data.samplesPerColumn.toLocaleString('en')} samples per column` : 'every sample';
    if (data.kind === 'constellation') return `${(data.points.length / 2).toLocaleString('en')} samples spread over the run`;
    return undefined;
  }, [plot.data]);
  const title = TITLES[kind](probe);
  return (
    <PlotCard ref={box} title={title} note={note} graph={graph} fileName={`${fileBase}-${kind}-${probe.stageId}`} testId={`${kind}-card-${probe.stageId}`}>
      {figure ? (
        <Plot label={title} testId={`${kind}-plot-${probe.stageId}`} height={HEIGHT} data={figure.data} layout={figure.layout} config={plotConfig} onReady={setGraph} />
      ) : (
        <PlotPlaceholder height={HEIGHT} text={plot.isError ? `Could not be loaded: ${(plot.error as Error).message}` : 'Loading…'} />
      )}
    </PlotCard>
  );
}
