/**
 * The designed response of a filter or decimate cell: magnitude (dB) above phase (deg) and group
 * delay (samples), sharing the frequency axis, with the pass band shaded in the accent colour and
 * the stop band hatched grey.
 */
import { useMemo } from 'react';
import type { Layout, Data, Shape } from 'plotly.js-dist-min';
import Plot, { PlotPlaceholder } from '@/components/plots/Plot';
import { axisScale, axisTitle, scaled } from '@/components/plots/axes';
import type { StageResponse } from './use-responses';

const HEIGHT = 360;

export default function ResponsePlot({ stageId, response }: { stageId: string; response: StageResponse | undefined }) {
  const result = response?.result;
  const pending = !result || result.key !== response?.key;
  const figure = useMemo(() => {
    if (!result) return null;
    const nyquist = result.frequencies[result.frequencies.length - 1];
    const scale = axisScale(0, result.initialRange[1] || nyquist, 'Hz');
    const x = scaled(result.frequencies, scale);
    const data: Data[] = [
      { x, y: result.magnitudeDb, type: 'scatter', mode: 'lines', name: 'Magnitude', line: { width: 1.5 }, hovertemplate: '%{x:.4g} ' + scale.unit + '<br>%{y:.2f} dB<extra></extra>' },
      { x, y: result.phaseDeg, type: 'scatter', mode: 'lines', name: 'Phase', yaxis: 'y2', line: { width: 1.2 }, hovertemplate: '%{x:.4g} ' + scale.unit + '<br>%{y:.1f}°<extra></extra>' },
      { x, y: result.groupDelay, type: 'scatter', mode: 'lines', name: 'Group delay', yaxis: 'y3', line: { width: 1.2 }, hovertemplate: '%{x:.4g} ' + scale.unit + '<br>%{y:.2f} samples<extra></extra>' },
    ];
    const band = (b: [number, number], colour: string, opacity: number): Partial<Shape> => ({
      type: 'rect',
      xref: 'x',
      yref: 'paper',
      x0: b[0] / scale.divisor,
      x1: b[1] / scale.divisor,
      y0: 0,
      y1: 1,
      fillcolor: colour,
      opacity,
      line: { width: 0 },
      layer: 'below',
    });
    const shapes: Partial<Shape>[] = [
      ...result.passBands.map((b) => band(b, 'rgb(20, 160, 120)', 0.12)),
      ...result.stopBands.map((b) => band(b, 'rgb(150, 150, 150)', 0.14)),
    ];
    if (result.marker) {
      shapes.push({ type: 'line', xref: 'x', yref: 'paper', x0: result.marker.frequency / scale.divisor, x1: result.marker.frequency / scale.divisor, y0: 0, y1: 1, line: { dash: 'dot', width: 1, color: 'rgb(200, 80, 40)' } });
    }
    const finiteDelays = result.groupDelay.filter(Number.isFinite);
    const layout: Partial<Layout> = {
      showlegend: false,
      margin: { l: 56, r: 12, t: 8, b: 40 },
      xaxis: { title: { text: axisTitle('Frequency', scale) }, range: [result.initialRange[0] / scale.divisor, result.initialRange[1] / scale.divisor], anchor: 'y3' },
      yaxis: { title: { text: 'dB' }, domain: [0.45, 1], range: [Math.max(-160, Math.min(...result.magnitudeDb) - 5), 5] },
      yaxis2: { title: { text: 'deg' }, domain: [0.25, 0.41], nticks: 3 },
      yaxis3: { title: { text: 'samples' }, domain: [0, 0.19], nticks: 3, range: finiteDelays.length ? delayRange(finiteDelays) : undefined },
      shapes,
    };
    return { data, layout };
  }, [result]);

  if (response?.error && !result) {
    return <p className="rounded border border-danger/40 bg-danger/5 px-3 py-2 text-xs text-danger">No response: {response.error}</p>;
  }
  if (!figure || !result) return <PlotPlaceholder height={HEIGHT} text="Designing…" />;
  return (
    <div className={pending ? 'opacity-60 transition-opacity' : 'transition-opacity'} data-response-key={result.key} data-response-pending={pending || undefined}>
      <div className="mb-1 flex flex-wrap items-center justify-between gap-x-3 text-xs text-muted">
        <span className="font-mono">{result.summary}</span>
        <span className="flex items-center gap-3">
          <Legend colour="rgb(20, 160, 120)" label="pass band" />
          <Legend colour="rgb(150, 150, 150)" label="stop band" />
          {result.marker && <Legend colour="rgb(200, 80, 40)" label={result.marker.label} line />}
        </span>
      </div>
      <Plot label={`Designed response of ${stageId}`} data={figure.data} layout={figure.layout} height={HEIGHT} testId={`response-${stageId}`} config={{ displayModeBar: 'hover' }} />
    </div>
  );
}

/** A group-delay axis range that ignores the spikes near response zeros. */
function delayRange(values: number[]): [number, number] {
  const sorted = [...values].sort((a, b) => a - b);
  const lo = sorted[Math.floor(sorted.length * 0.02)];
  const hi = sorted[Math.floor(sorted.length * 0.98)];
  const pad = Math.max(1, (hi - lo) * 0.15);
  return [lo - pad, hi + pad];
}

function Legend({ colour, label, line }: { colour: string; label: string; line?: boolean }) {
  return (
    <span className="flex items-center gap-1">
      <span aria-hidden className={line ? 'inline-block h-0 w-3 border-t border-dotted' : 'inline-block h-2.5 w-3 rounded-sm opacity-50'} style={line ? { borderColor: colour } : { background: colour }} />
      {label}
    </span>
  );
}
