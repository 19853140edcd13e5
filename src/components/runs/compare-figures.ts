/**
 * The comparison of runs: overlaid spectra (one trace per run, named by capture and chain
 * revision) and the rule that flags a readout difference as large.
 */
import type { Data, Layout } from 'plotly.js-dist-min';
import { axisScale, axisTitle, scaled } from '../plots/axes';
import { plotLevels } from '../plots/figures';
import type { PlotTheme } from '../plots/plot-theme';
import type { ComparedSpectrum, Run } from './types';

// After the theme's three series colours, further runs take colours that stay apart on both the
// light and the dark panel.
const EXTRA_COLOURS = [
  'rgba(22, 163, 74, 1)',
  'rgba(219, 39, 119, 1)',
  'rgba(202, 138, 4, 1)',
  'rgba(100, 116, 139, 1)',
  'rgba(8, 145, 178, 1)',
  'rgba(220, 38, 38, 1)',
  'rgba(79, 70, 229, 1)',
];

/** Colour of the run at `index` in the comparison. */
export function runColour(theme: PlotTheme, index: number): string {
  const colours = [...theme.series, ...EXTRA_COLOURS];
  return colours[index % colours.length]!;
}

/** Legend name of a run: capture name and chain revision, and the chain name when the runs' chains differ. */
export function legendName(run: Pick<Run, 'capture' | 'chain'>, chainsDiffer: boolean): string {
  return chainsDiffer ? `${run.capture.name} · ${run.chain.name} r${run.chain.revision}` : `${run.capture.name} · r${run.chain.revision}`;
}

/** Overlaid spectra of one probe: one line per run, in the runs' order. */
export function overlayFigure(spectra: ComparedSpectrum[], runs: Run[], theme: PlotTheme): { data: Data[]; layout: Partial<Layout> } {
  let low = Infinity;
  let high = -Infinity;
  for (const s of spectra) {
    if (s.frequencies.length === 0) continue;
    low = Math.min(low, s.frequencies[0]!);
    high = Math.max(high, s.frequencies[s.frequencies.length - 1]!);
  }
  const scale = axisScale(Number.isFinite(low) ? low : 0, Number.isFinite(high) ? high : 1, 'Hz');
  const chainsDiffer = new Set(runs.map((run) => run.chain.id)).size > 1;
  const data: Data[] = spectra.map((s) => {
    const index = runs.findIndex((run) => run.id === s.runId);
    const run = runs[index];
    const name = run ? legendName(run, chainsDiffer) : s.runId;
    return {
      type: 'scatter',
      mode: 'lines',
      name,
      x: scaled(s.frequencies, scale),
      y: plotLevels(s.levels),
      line: { color: runColour(theme, Math.max(0, index)), width: 1.25 },
      hovertemplate: `${name.replace(/[<>]/g, '')}<br>%{x:.6~f} ${scale.unit}<br>%{y:.2f} ${s.unit}<extra></extra>`,
    };
  });
  const unit = spectra[0]?.unit ?? 'dB';
  return {
    data,
    layout: {
      showlegend: true,
      hovermode: 'x unified',
      uirevision: 'compare',
      margin: { l: 60, r: 16, t: 8, b: 44 },
      xaxis: { title: { text: axisTitle('Frequency offset', scale) }, zeroline: false },
      yaxis: { title: { text: `Level (${unit})` }, zeroline: false },
    },
  };
}

/**
 * Whether a readout difference deserves attention: 1 dB or more for levels and ratios in dB,
 * otherwise 10 % or more of the baseline's magnitude (any change from a zero baseline). Both
 * thresholds are a judgement for bench comparisons (common practice), not a standard.
 */
export function isLargeDifference(unit: string, difference: number | null, baseline: number | null): boolean {
  if (difference === null || !Number.isFinite(difference)) return false;
  if (unit.startsWith('dB')) return Math.abs(difference) >= 1;
  if (baseline === null || baseline === 0) return difference !== 0;
  return Math.abs(difference) >= 0.1 * Math.abs(baseline);
}
