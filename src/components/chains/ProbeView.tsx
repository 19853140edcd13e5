/** What the preview found at a probe: its spectrum, its spectrogram image, its readouts. */
import { useMemo } from 'react';
import type { Data, Layout } from 'plotly.js-dist-min';
import Plot from '@/components/plots/Plot';
import { axisScale, axisTitle, scaled } from '@/components/plots/axes';
import { plotLevels, spectrogramTrace } from '@/components/plots/figures';
import { usePlotTheme } from '@/components/plots/plot-theme';
import { formatQuantity } from '@/lib/units';
import type { PreviewProbe } from './preview-protocol';
import { readoutNote } from '@/components/runs/readout-notes';

export default function ProbeView({ probe, stale }: { probe: PreviewProbe; stale: boolean }) {
  return (
    <div className={'space-y-3 ' + (stale ? 'opacity-60' : '')} data-probe={probe.stageId} data-probe-stale={stale || undefined}>
      {probe.spectrum && <SpectrumPlot probe={probe} />}
      {probe.spectrogram && <SpectrogramPlot probe={probe} />}
      {probe.readouts && probe.readouts.length > 0 && <Readouts probe={probe} />}
    </div>
  );
}

function SpectrumPlot({ probe }: { probe: PreviewProbe }) {
  const spectrum = probe.spectrum!;
  const figure = useMemo(() => {
    const f = spectrum.frequencies;
    const scale = axisScale(f[0], f[f.length - 1], 'Hz');
    const data: Data[] = [{ x: scaled(f, scale), y: plotLevels(spectrum.levels), type: 'scatter', mode: 'lines', line: { width: 1 }, hovertemplate: `%{x:.5g} ${scale.unit}<br>%{y:.1f} ${spectrum.unit}<extra></extra>` }];
    const layout: Partial<Layout> = {
      showlegend: false,
      margin: { l: 56, r: 12, t: 8, b: 40 },
      xaxis: { title: { text: axisTitle('Frequency', scale) } },
      yaxis: { title: { text: spectrum.unit } },
    };
    return { data, layout };
  }, [spectrum]);
  return (
    <div>
      <p className="mb-1 flex flex-wrap gap-x-4 font-mono text-xs text-muted">
        <span>peak {formatQuantity(spectrum.peak.frequency, 'Hz', { significant: 6 })} at {formatQuantity(spectrum.peak.level, spectrum.unit, { decimals: 1 })}</span>
        <span>RBW {formatQuantity(spectrum.resolutionBandwidth, 'Hz')}</span>
        <span>{spectrum.segments} segments</span>
      </p>
      <Plot label={`Preview spectrum at ${probe.stageId}`} data={figure.data} layout={figure.layout} height={260} testId={`probe-spectrum-${probe.stageId}`} config={{ displayModeBar: 'hover' }} />
    </div>
  );
}

function SpectrogramPlot({ probe }: { probe: PreviewProbe }) {
  const image = probe.spectrogram!;
  const theme = usePlotTheme();
  const figure = useMemo(() => {
    const f = image.frequencies;
    const xs = axisScale(f[0] ?? 0, f[f.length - 1] ?? 1, 'Hz');
    const t = image.times;
    const ts = axisScale(0, t[t.length - 1] || 1e-3, 's');
    const data: Data[] = [spectrogramTrace({ x: scaled(f, xs), y: scaled(t, ts), levels: image.levels, unit: image.unit, frequencyScale: xs, timeScale: ts, theme, frequencyDecimals: 5 })];
    const layout: Partial<Layout> = { margin: { l: 56, r: 12, t: 8, b: 40 }, xaxis: { title: { text: axisTitle('Frequency', xs) } }, yaxis: { title: { text: axisTitle('Time', ts) } } };
    return { data, layout };
  }, [image, theme]);
  return <Plot label={`Preview spectrogram at ${probe.stageId}`} data={figure.data} layout={figure.layout} height={280} testId={`probe-spectrogram-${probe.stageId}`} config={{ displayModeBar: 'hover' }} />;
}

function Readouts({ probe }: { probe: PreviewProbe }) {
  return (
    <table className="w-full max-w-xl text-sm" data-testid={`probe-readouts-${probe.stageId}`}>
      <caption className="sr-only">Readouts at {probe.stageId}</caption>
      <tbody>
        {probe.readouts!.map((r) => (
          <tr key={r.name} className="border-b border-line/60 last:border-0">
            <th scope="row" className="py-1 pr-4 text-left font-normal text-muted">
              {r.name}
            </th>
            <td className="py-1 text-right font-mono tabular-nums" title={readoutNote(r) || undefined}>
              {r.value === null ? <span className="text-muted">—</span> : formatQuantity(r.value, r.unit, r.unit === 'Hz' ? { significant: 7 } : {})}
              {readoutNote(r) && <span className="block text-xs font-sans text-muted">{readoutNote(r)}</span>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
