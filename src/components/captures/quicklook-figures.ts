/**
 * Plotly figures of the quick look: spectrum, spectrogram with annotation rectangles, and I and Q
 * against time as min/max bands. Frequencies are RF when the centre frequency is known.
 */
import type { Layout } from 'plotly.js-dist-min';
import { axisScale, axisTitle, scaled } from '../plots/axes';
import { channelNames, columnTimes, minMaxTraces, plotLevels, spectrogramTrace, type Figure } from '../plots/figures';
import type { PlotTheme } from '../plots/plot-theme';
import type { QuickLookResult } from './quicklook-analysis';
import type { SpectrogramAxes } from './annotation-selection';
import type { Annotation } from './types';
import type { SampleType } from '@/dsp/types';

export type { Figure };

/** Frequency axis of the quick look: RF when the centre is known, else relative to the capture's 0 Hz. */
function frequencyAxis(result: QuickLookResult, centerFrequency: number | null) {
  const offset = centerFrequency ?? 0;
  const freqs = result.spectrum.frequencies;
  const scale = axisScale(freqs[0] + offset, freqs[freqs.length - 1] + offset, 'Hz');
  const label = centerFrequency !== null ? 'Frequency' : result.sampleType === 'complex' ? 'Frequency offset from the centre' : 'Frequency';
  return { offset, scale, title: axisTitle(label, scale) };
}

/** Welch spectrum in dBFS/Hz against frequency. */
export function spectrumFigure(result: QuickLookResult, centerFrequency: number | null, theme: PlotTheme): Figure {
  const axis = frequencyAxis(result, centerFrequency);
  const { spectrum } = result;
  return {
    data: [
      {
        type: 'scatter',
        mode: 'lines',
        name: 'Welch PSD',
        x: scaled(spectrum.frequencies, axis.scale, axis.offset),
        y: plotLevels(spectrum.levels),
        line: { color: theme.accent, width: 1.25 },
        hovertemplate: `%{x:.6~f} ${axis.scale.unit}<br>%{y:.1f} ${spectrum.unit}<extra></extra>`,
      },
    ],
    layout: {
      showlegend: false,
      xaxis: { title: { text: axis.title }, zeroline: false },
      yaxis: { title: { text: `Level (${spectrum.unit})` }, zeroline: false },
    },
  };
}

/** Units of the spectrogram's axes, so a box dragged on it reads back in Hz and seconds. */
export function spectrogramAxes(result: QuickLookResult, centerFrequency: number | null): SpectrogramAxes {
  const axis = frequencyAxis(result, centerFrequency);
  const freqs = result.spectrogram.frequencies;
  const duration = result.samples / result.sampleRate;
  return {
    frequencyDivisor: axis.scale.divisor,
    timeDivisor: axisScale(0, duration, 's').divisor,
    frequencyLow: freqs[0] + axis.offset,
    frequencyHigh: freqs[freqs.length - 1] + axis.offset,
    duration,
  };
}

/** Spectrogram as a heatmap (time up, frequency across) with annotations drawn as rectangles. */
export function spectrogramFigure(result: QuickLookResult, centerFrequency: number | null, annotations: Annotation[], theme: PlotTheme): Figure {
  const axis = frequencyAxis(result, centerFrequency);
  const { spectrogram } = result;
  const duration = result.samples / result.sampleRate;
  // One scale for drawing and for reading a dragged box back (spectrogramAxes).
  const timeScale = axisScale(0, duration, 's');
  const x = scaled(spectrogram.frequencies, axis.scale, axis.offset);
  const xLow = x[0];
  const xHigh = x[x.length - 1];
  const shapes: NonNullable<Layout['shapes']> = [];
  const labels: NonNullable<Layout['annotations']> = [];
  for (const a of annotations) {
    const start = a.sampleStart / result.sampleRate;
    if (start >= duration) continue;
    const end = a.sampleCount !== null ? Math.min(duration, (a.sampleStart + a.sampleCount) / result.sampleRate) : duration;
    // SigMF edges are RF frequencies; without a centre frequency they can only be read as offsets.
    const x0 = a.freqLowerEdge !== null ? a.freqLowerEdge / axis.scale.divisor : xLow;
    const x1 = a.freqUpperEdge !== null ? a.freqUpperEdge / axis.scale.divisor : xHigh;
    const y0 = start / timeScale.divisor;
    const y1 = end / timeScale.divisor;
    shapes.push({ type: 'rect', xref: 'x', yref: 'y', x0, x1, y0, y1, line: { color: 'rgba(255,255,255,0.95)', width: 1.5, dash: 'dot' }, fillcolor: 'rgba(0,0,0,0)' });
    if (a.label) {
      labels.push({
        x: x0, y: y1, xref: 'x', yref: 'y', text: a.label, showarrow: false, xanchor: 'left', yanchor: 'top',
        font: { size: 11, color: '#ffffff' }, bgcolor: 'rgba(0,0,0,0.55)', borderpad: 2,
      });
    }
  }
  return {
    data: [
      spectrogramTrace({
        x,
        y: scaled(spectrogram.times, timeScale),
        levels: spectrogram.levels,
        unit: spectrogram.unit,
        frequencyScale: axis.scale,
        timeScale,
        theme,
        frequencyDecimals: 6,
      }),
    ],
    layout: {
      xaxis: { title: { text: axis.title }, showgrid: false, zeroline: false },
      yaxis: { title: { text: axisTitle('Time', timeScale) }, showgrid: false, zeroline: false },
      shapes,
      annotations: labels,
    },
  };
}

/**
 * I and Q (or the real signal) against time: a min/max band per pixel column, one panel per
 * channel on a shared time axis so neither channel hides the other.
 */
export function traceFigure(result: QuickLookResult, layout: SampleType, theme: PlotTheme): Figure {
  const { trace } = result;
  const columns = trace.channels[0]?.min.length ?? 0;
  const timeScale = axisScale(0, result.samples / result.sampleRate, 's');
  const times = columnTimes(columns, trace.samplesPerColumn, trace.sampleRate, timeScale);
  const names = channelNames(layout);
  const two = trace.channels.length === 2;
  const data = minMaxTraces({
    times,
    channels: trace.channels,
    samplesPerColumn: trace.samplesPerColumn,
    names,
    timeScale,
    theme,
    fillOpacity: 0.3,
    axes: trace.channels.map((_, index) => (index === 0 ? 'y' : 'y2')),
  });
  const yTitle = (index: number) => `${names[index]} (FS)`;
  return {
    data,
    layout: {
      showlegend: false,
      hovermode: 'x',
      xaxis: { title: { text: axisTitle('Time', timeScale) }, zeroline: false, anchor: two ? 'y2' : 'y' },
      yaxis: { title: { text: yTitle(0) }, zeroline: true, domain: two ? [0.54, 1] : [0, 1] },
      ...(two ? { yaxis2: { title: { text: yTitle(1) }, zeroline: true, domain: [0, 0.46] } } : {}),
    },
  };
}
