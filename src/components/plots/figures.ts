/**
 * The figure pieces every plotting page shares (capture quick look, chain preview, run probes,
 * run comparison): channel names, the colour-scale floor, spectrogram heatmaps and min/max trace
 * bands. One rule for a level that has no value: it is `null` in what Plotly draws, so lines break
 * and heatmap cells stay empty instead of pulling the scale down to the engine's floor.
 */
import type { Data, Layout } from 'plotly.js-dist-min';
import { LEVEL_FLOOR_DB } from '@/dsp/spectral/levels';
import type { SampleType } from '@/dsp/types';
import type { AxisScale } from './axes';
import type { PlotTheme } from './plot-theme';

/** A Plotly figure without theme: data and layout. */
export interface Figure {
  data: Data[];
  layout: Partial<Layout>;
}

/** A level (dB) or null when it has no value. */
export type Level = number | null;

/**
 * Whether a level carries no value: null (the server's JSON for a missing bin), not finite, or at
 * the engine's floor (LEVEL_FLOOR_DB, where a bin of exactly zero power is put).
 */
export function isMissingLevel(value: number | null | undefined): boolean {
  return value === null || value === undefined || !Number.isFinite(value) || value <= LEVEL_FLOOR_DB;
}

/** Levels with every missing value as null (the one marker Plotly draws as a gap). */
export function plotLevels(levels: ArrayLike<Level>): Level[] {
  const out = new Array<Level>(levels.length);
  for (let k = 0; k < levels.length; k++) out[k] = isMissingLevel(levels[k]) ? null : levels[k]!;
  return out;
}

/** Level (dB) below which a fraction `p` (0..1) of the present values lie; undefined when none is present. */
export function percentile(levels: ArrayLike<Level>[], p: number): number | undefined {
  const all: number[] = [];
  for (const row of levels) {
    for (let k = 0; k < row.length; k++) {
      const value = row[k];
      if (!isMissingLevel(value)) all.push(value!);
    }
  }
  if (all.length === 0) return undefined;
  all.sort((a, b) => a - b);
  return all[Math.min(all.length - 1, Math.floor(p * all.length))];
}

/** Names of the channels of a stream, by sample type: I and Q, the two channels of a pair, or one signal. */
export function channelNames(sampleType: SampleType): string[] {
  if (sampleType === 'complex') return ['I', 'Q'];
  if (sampleType === 'real-pair') return ['Channel 0 (I)', 'Channel 1 (Q)'];
  return ['Signal'];
}

export interface SpectrogramInput {
  /** Frequencies and times already divided by their axis scales. */
  x: number[];
  y: number[];
  levels: ArrayLike<Level>[];
  unit: string;
  frequencyScale: AxisScale;
  timeScale: AxisScale;
  theme: PlotTheme;
  /** Significant decimals of the frequency in the hover text (default 7). */
  frequencyDecimals?: number;
}

/**
 * A spectrogram heatmap (frequency across, time up): Viridis from the 5th percentile of the present
 * levels, so a few empty or near-empty cells do not wash the picture out.
 */
export function spectrogramTrace({ x, y, levels, unit, frequencyScale, timeScale, theme, frequencyDecimals = 7 }: SpectrogramInput): Data {
  return {
    type: 'heatmap',
    x,
    y,
    z: levels.map((row) => plotLevels(row)),
    colorscale: 'Viridis',
    zmin: percentile(levels, 0.05),
    colorbar: {
      title: { text: unit, side: 'right', font: { size: 11, color: theme.muted } },
      thickness: 10,
      outlinewidth: 0,
      tickfont: { family: '"JetBrains Mono Variable", ui-monospace, monospace', size: 10, color: theme.muted },
    },
    hovertemplate: `%{x:.${frequencyDecimals}~f} ${frequencyScale.unit}<br>%{y:.4~f} ${timeScale.unit}<br>%{z:.1f} ${unit}<extra></extra>`,
  } as Data;
}

export interface MinMaxInput {
  /** Column times, already divided by the time scale. */
  times: number[];
  channels: { min: ArrayLike<number>; max: ArrayLike<number> }[];
  /** Input samples per column: 1 draws plain lines, more a band between min and max. */
  samplesPerColumn: number;
  names: string[];
  timeScale: AxisScale;
  theme: PlotTheme;
  /** Opacity of the band's fill (0..1). */
  fillOpacity: number;
  /** Plotly y axis of each channel ('y', 'y2'), when the channels sit in panels of their own. */
  axes?: string[];
}

/** A channel's signal against time as a min/max band per pixel column (or a line when each column is one sample). */
export function minMaxTraces({ times, channels, samplesPerColumn, names, timeScale, theme, fillOpacity, axes }: MinMaxInput): Data[] {
  const traces: Data[] = [];
  channels.forEach((channel, index) => {
    const colour = theme.series[index % theme.series.length]!;
    const fill = colour.replace(/, 1\)$/, `, ${fillOpacity})`);
    const name = names[index] ?? `Channel ${index}`;
    const yaxis = axes?.[index];
    const hover = `${name}: %{y:.4f} FS at %{x:.5~f} ${timeScale.unit}<extra></extra>`;
    const common = { type: 'scatter' as const, mode: 'lines' as const, name, legendgroup: name, x: times, hovertemplate: hover, ...(yaxis ? { yaxis } : {}) };
    if (samplesPerColumn <= 1) {
      traces.push({ ...common, y: Array.from(channel.max), line: { color: colour, width: 1 } });
      return;
    }
    traces.push({ ...common, showlegend: false, y: Array.from(channel.min), line: { color: colour, width: 0.75 } });
    traces.push({ ...common, y: Array.from(channel.max), fill: 'tonexty', fillcolor: fill, line: { color: colour, width: 0.75 } });
  });
  return traces;
}

/** Times (in `scale` units) of `columns` columns of `samplesPerColumn` samples at `sampleRate` (Hz). */
export function columnTimes(columns: number, samplesPerColumn: number, sampleRate: number, scale: AxisScale): number[] {
  const times = new Array<number>(columns);
  for (let c = 0; c < columns; c++) times[c] = (c * samplesPerColumn) / sampleRate / scale.divisor;
  return times;
}
