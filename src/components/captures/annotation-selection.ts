/**
 * A box dragged on the quick-look spectrogram, read back into a new annotation's start, duration
 * and frequency edges. The plot's axes carry SI-prefixed units (x in e.g. MHz of RF frequency
 * when the centre is known, y in e.g. ms from the start of the capture), so the box is scaled
 * back to Hz and seconds, clipped to what the spectrogram covers and rounded to readable steps.
 */
import { formatEdge, formatSampleTime, type AnnotationFormValues } from './annotation-form';

/** How the spectrogram plots its axes. */
export interface SpectrogramAxes {
  /** Hz per x-axis unit (1e6 when the axis reads MHz). */
  frequencyDivisor: number;
  /** Seconds per y-axis unit (1e-3 when the axis reads ms). */
  timeDivisor: number;
  /** Lowest and highest plotted frequency (Hz, RF when the centre frequency is known). */
  frequencyLow: number;
  frequencyHigh: number;
  /** Seconds the spectrogram covers (the quick look's head of the capture). */
  duration: number;
}

/** A dragged rectangle in axis units, corners in any order. */
export interface SelectionBox {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

/**
 * The rectangle of a Plotly relayout event after a box select (`selections: [{type:'rect',...}]`),
 * or null for any other relayout (zoom, pan, a cleared selection).
 */
export function selectionFromRelayout(event: Record<string, unknown>): SelectionBox | null {
  const selections = event.selections;
  if (!Array.isArray(selections) || selections.length === 0) return null;
  const last = selections[selections.length - 1] as Record<string, unknown>;
  const { x0, x1, y0, y1 } = last;
  if (last.type !== 'rect' || ![x0, x1, y0, y1].every((v) => typeof v === 'number' && Number.isFinite(v))) return null;
  return { x0: x0 as number, x1: x1 as number, y0: y0 as number, y1: y1 as number };
}

/** `value` rounded to a power of ten close to a thousandth of `span`, so a dragged edge reads short. */
function roundToSpan(value: number, span: number): number {
  if (!(span > 0)) return value;
  const step = 10 ** Math.floor(Math.log10(span / 1000));
  return Math.round(value / step) * step;
}

/**
 * Start, duration and RF edges (as the editor's text) for a box dragged on the spectrogram at
 * `sampleRate` (Hz); null when the box misses the plotted data or spans less than one sample.
 */
export function selectionValues(box: SelectionBox, axes: SpectrogramAxes, sampleRate: number): Pick<AnnotationFormValues, 'start' | 'duration' | 'lowerEdge' | 'upperEdge'> | null {
  const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
  const t0 = clamp(Math.min(box.y0, box.y1) * axes.timeDivisor, 0, axes.duration);
  const t1 = clamp(Math.max(box.y0, box.y1) * axes.timeDivisor, 0, axes.duration);
  const f0 = clamp(Math.min(box.x0, box.x1) * axes.frequencyDivisor, axes.frequencyLow, axes.frequencyHigh);
  const f1 = clamp(Math.max(box.x0, box.x1) * axes.frequencyDivisor, axes.frequencyLow, axes.frequencyHigh);
  const lastSample = Math.round(axes.duration * sampleRate);
  const start = clamp(Math.round(roundToSpan(t0, axes.duration) * sampleRate), 0, lastSample);
  const end = clamp(Math.round(roundToSpan(t1, axes.duration) * sampleRate), 0, lastSample);
  if (end - start < 1 || !(f1 > f0)) return null;
  const span = axes.frequencyHigh - axes.frequencyLow;
  return {
    start: formatSampleTime(start, sampleRate),
    duration: formatSampleTime(end - start, sampleRate),
    lowerEdge: formatEdge(roundToSpan(f0, span)),
    upperEdge: formatEdge(roundToSpan(f1, span)),
  };
}
