/**
 * Plotly figures of a run's probes: spectrum with peak, noise floor and the two markers;
 * spectrogram as a heatmap; I and Q against time as min/max bands; constellation. Frequencies are
 * RF when the probed stream knows its centre frequency, else offsets from its 0 Hz.
 */
import type { Data, Layout, Shape } from 'plotly.js-dist-min';
import { axisScale, axisTitle, scaled, type AxisScale } from '../plots/axes';
import { channelNames, columnTimes, minMaxTraces, plotLevels, spectrogramTrace, type Figure } from '../plots/figures';
import type { PlotTheme } from '../plots/plot-theme';
import type { Marker, MarkerName } from './markers';
import type { ConstellationPlotData, SpectrogramPlotData, SpectrumPlotData, TracePlotData } from './types';
import type { StreamFormat } from '@/dsp/types';
import { formatQuantity } from '@/lib/units';

export type { Figure };

/** The frequency axis of a probe: the offset added to stream frequencies (Hz), the unit scale and the title. */
export interface FrequencyAxis {
  offset: number;
  scale: AxisScale;
  title: string;
}

// Above this ratio of centre frequency to span, RF ticks would need eight or more digits
// (2,412,350 kHz); the axis then shows offsets from the centre and names the centre in its title.
const RF_TICKS_MAX_RATIO = 1000;

/**
 * Frequency axis spanning `low`..`high` (Hz from the stream's 0 Hz) for a stream of `format`: RF
 * when the stream knows its centre and RF ticks stay short, else offsets from the centre.
 */
export function frequencyAxis(format: StreamFormat, low: number, high: number): FrequencyAxis {
  const centre = format.centerFrequency;
  const span = Math.abs(high - low) || 1;
  if (centre !== undefined && Math.abs(centre) / span <= RF_TICKS_MAX_RATIO) {
    const scale = axisScale(low + centre, high + centre, 'Hz');
    return { offset: centre, scale, title: axisTitle('Frequency', scale) };
  }
  const scale = axisScale(low, high, 'Hz');
  const label =
    centre !== undefined
      ? `Offset from ${formatQuantity(centre, 'Hz', { significant: 9 })}`
      : format.sampleType === 'complex'
        ? 'Frequency offset'
        : 'Frequency';
  return { offset: 0, scale, title: axisTitle(label, scale) };
}

/** Plot x of a stream frequency (Hz). */
export function toAxis(axis: FrequencyAxis, frequency: number): number {
  return (frequency + axis.offset) / axis.scale.divisor;
}

/** Stream frequency (Hz) of a plot x. */
export function fromAxis(axis: FrequencyAxis, x: number): number {
  return x * axis.scale.divisor - axis.offset;
}

/** Colour of the markers: the third series colour, apart from the trace and the peak. */
export function markerColour(theme: PlotTheme): string {
  return theme.series[2] ?? theme.ink;
}

export interface SpectrumFigureInput {
  data: SpectrumPlotData;
  axis: FrequencyAxis;
  /** Median level in the spectrum's unit, or null. */
  noiseFloor: number | null;
  markers: Partial<Record<MarkerName, Marker>>;
  theme: PlotTheme;
}

/** Names of the marker shapes in layout order, so a dragged shape's index finds its marker. */
export const MARKER_SHAPES: MarkerName[] = ['A', 'B'];

/** Spectrum with its peak, a dashed noise-floor line and the markers as draggable vertical lines. */
export function spectrumFigure({ data, axis, noiseFloor, markers, theme }: SpectrumFigureInput): Figure {
  const x = scaled(data.frequencies, axis.scale, axis.offset);
  const unit = data.unit;
  const traces: Data[] = [
    {
      type: 'scatter',
      mode: 'lines',
      name: 'spectrum',
      x,
      y: plotLevels(data.levels),
      line: { color: theme.accent, width: 1.25 },
      hovertemplate: `%{x:.7~f} ${axis.scale.unit}<br>%{y:.2f} ${unit}<extra></extra>`,
    },
  ];
  if (noiseFloor !== null && x.length > 1) {
    traces.push({
      type: 'scatter',
      mode: 'lines',
      name: 'noise floor',
      x: [x[0], x[x.length - 1]],
      y: [noiseFloor, noiseFloor],
      line: { color: theme.muted, width: 1, dash: 'dash' },
      hoverinfo: 'skip',
    });
  }
  if (data.peak.level !== null) {
    traces.push({
      type: 'scatter',
      mode: 'text+markers',
      name: 'peak',
      x: [toAxis(axis, data.peak.frequency)],
      y: [data.peak.level],
      text: ['peak'],
      // Left of the peak, so a marker put on the peak (its label on the right) stays readable.
      textposition: 'top left',
      textfont: { size: 11, color: theme.series[1] },
      marker: { symbol: 'triangle-down', size: 10, color: theme.series[1] },
      hoverinfo: 'skip',
      cliponaxis: false,
    });
  }
  const colour = markerColour(theme);
  const shapes: Partial<Shape>[] = [];
  const placed = MARKER_SHAPES.filter((name) => markers[name]);
  for (const name of MARKER_SHAPES) {
    const marker = markers[name];
    // A shape per marker name keeps shape indices stable, so a drag maps back to its marker.
    const at = marker ? toAxis(axis, marker.frequency) : (x[0] ?? 0);
    shapes.push({
      type: 'line',
      xref: 'x',
      yref: 'paper',
      x0: at,
      x1: at,
      y0: 0,
      y1: 1,
      visible: marker !== undefined,
      line: { color: colour, width: 1.25, dash: name === 'A' ? 'dot' : 'dashdot' },
    });
  }
  if (placed.length > 0) {
    traces.push({
      type: 'scatter',
      mode: 'text+markers',
      name: 'markers',
      x: placed.map((name) => toAxis(axis, markers[name]!.frequency)),
      y: placed.map((name) => markers[name]!.level),
      text: placed,
      textposition: 'top right',
      textfont: { size: 12, color: colour },
      marker: { symbol: 'diamond', size: 9, color: colour, line: { width: 1, color: theme.panel } },
      hoverinfo: 'skip',
      cliponaxis: false,
    });
  }
  return {
    data: traces,
    layout: {
      showlegend: false,
      hovermode: 'x',
      uirevision: 'spectrum',
      margin: { l: 60, r: 16, t: 16, b: 44 },
      xaxis: { title: { text: axis.title }, zeroline: false, exponentformat: 'none' },
      yaxis: { title: { text: `Level (${unit})` }, zeroline: false },
      shapes: shapes as Layout['shapes'],
    },
  };
}

/** Spectrogram as a heatmap: frequency across, time up, level as colour. */
export function spectrogramFigure(data: SpectrogramPlotData, axis: FrequencyAxis, theme: PlotTheme): Figure {
  const duration = data.times.length > 1 ? data.times[data.times.length - 1]! : 1e-3;
  const timeScale = axisScale(0, duration, 's');
  return {
    data: [
      spectrogramTrace({
        x: scaled(data.frequencies, axis.scale, axis.offset),
        y: scaled(data.times, timeScale),
        levels: data.levels,
        unit: data.unit,
        frequencyScale: axis.scale,
        timeScale,
        theme,
      }),
    ],
    layout: {
      uirevision: 'spectrogram',
      xaxis: { title: { text: axis.title }, showgrid: false, zeroline: false, exponentformat: 'none' },
      yaxis: { title: { text: axisTitle('Time', timeScale) }, showgrid: false, zeroline: false },
    },
  };
}

/** I and Q (or the real signal) against time, a min/max band per pixel column and channel. */
export function traceFigure(data: TracePlotData, theme: PlotTheme): Figure {
  const columns = data.channels[0]?.min.length ?? 0;
  const timeScale = axisScale(0, (columns * data.samplesPerColumn) / data.sampleRate || 1e-3, 's');
  const times = columnTimes(columns, data.samplesPerColumn, data.sampleRate, timeScale);
  // Light fills, so where the I and Q bands overlap both stay visible.
  const traces = minMaxTraces({
    times,
    channels: data.channels,
    samplesPerColumn: data.samplesPerColumn,
    names: channelNames(data.format.sampleType),
    timeScale,
    theme,
    fillOpacity: 0.2,
  });
  return {
    data: traces,
    layout: {
      showlegend: true,
      uirevision: 'trace',
      hovermode: 'x',
      xaxis: { title: { text: axisTitle('Time', timeScale) }, zeroline: false },
      yaxis: { title: { text: 'Amplitude (FS)' }, zeroline: true },
    },
  };
}

/**
 * Constellation: Q against I with equal scales. SVG points: the server sends at most one point per
 * pixel column (a few thousand), which SVG draws quickly, so the page needs no WebGL traces.
 */
export function constellationFigure(data: ConstellationPlotData, theme: PlotTheme): Figure {
  const i: number[] = [];
  const q: number[] = [];
  for (let k = 0; k + 1 < data.points.length; k += 2) {
    i.push(data.points[k]!);
    q.push(data.points[k + 1]!);
  }
  return {
    data: [
      {
        type: 'scatter',
        mode: 'markers',
        name: 'samples',
        x: i,
        y: q,
        marker: { size: 3, color: theme.accent, opacity: 0.55 },
        hovertemplate: 'I %{x:.4f}<br>Q %{y:.4f}<extra></extra>',
      },
    ],
    layout: {
      showlegend: false,
      uirevision: 'constellation',
      xaxis: { title: { text: 'I (FS)' }, zeroline: true, constrain: 'domain' },
      yaxis: { title: { text: 'Q (FS)' }, zeroline: true, scaleanchor: 'x', scaleratio: 1 },
    },
  };
}
