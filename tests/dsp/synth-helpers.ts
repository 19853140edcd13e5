/** Measurement helpers for the synthesizer tests (plain DFT sums and the engine's Welch PSD). */
import { WelchAccumulator } from '@/dsp/spectral';
import type { WindowName } from '@/dsp/windows';

/**
 * DFT of a capture at one frequency (Hz) over all its samples, divided by the sample count: for a
 * complex tone A e^{j 2 pi f t} on a bin of the record this is A e^{j phase}.
 */
export function dftAt(values: Float32Array, layout: 'complex' | 'real', sampleRate: number, frequency: number): { re: number; im: number } {
  const n = layout === 'complex' ? values.length / 2 : values.length;
  const w = (-2 * Math.PI * frequency) / sampleRate;
  let re = 0;
  let im = 0;
  for (let k = 0; k < n; k++) {
    // Reduce the phase per sample so long records keep full precision.
    const phase = w * k;
    const c = Math.cos(phase);
    const s = Math.sin(phase);
    const x = layout === 'complex' ? values[2 * k] : values[k];
    const y = layout === 'complex' ? values[2 * k + 1] : 0;
    re += x * c - y * s;
    im += x * s + y * c;
  }
  return { re: re / n, im: im / n };
}

/** 20 log10 of a magnitude (dB). */
export function db20(x: number): number {
  return 20 * Math.log10(x);
}

/** 10 log10 of a power (dB). */
export function db10(x: number): number {
  return 10 * Math.log10(x);
}

/** Mean of the squared values of a block (power per value). */
export function meanSquare(values: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < values.length; k++) s += values[k] * values[k];
  return s / values.length;
}

/** Welch PSD of a whole capture with the engine's accumulator. */
export function welch(values: Float32Array, layout: 'complex' | 'real', sampleRate: number, fftSize: number, window: WindowName, scaling: 'density' | 'spectrum'): { frequencies: Float64Array; power: Float64Array } {
  const acc = new WelchAccumulator({ sampleRate, sampleType: layout, fftSize, window, scaling, overlap: 0.5 });
  acc.push(values);
  acc.finish();
  return { frequencies: acc.frequencies(), power: acc.power() };
}

/** Highest power in a Welch result within [low, high] Hz, with its frequency. */
export function peakIn(spectrum: { frequencies: Float64Array; power: Float64Array }, low: number, high: number): { frequency: number; power: number } {
  let best = { frequency: NaN, power: -Infinity };
  for (let k = 0; k < spectrum.frequencies.length; k++) {
    const f = spectrum.frequencies[k];
    if (f >= low && f <= high && spectrum.power[k] > best.power) best = { frequency: f, power: spectrum.power[k] };
  }
  return best;
}

/** Values of channel `channel` (0 = I, 1 = Q) of an interleaved block. */
export function channel(values: Float32Array, index: 0 | 1): Float64Array {
  const out = new Float64Array(values.length / 2);
  for (let k = 0; k < out.length; k++) out[k] = values[2 * k + index];
  return out;
}
