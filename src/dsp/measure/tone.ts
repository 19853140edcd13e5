/** Tone readouts: the strongest component, its interpolated frequency (Hz) and power. */
import type { MeasuredSpectrum } from './measured-spectrum';

export interface ToneReading {
  /** Display-order index of the peak bin. */
  bin: number;
  /** Interpolated frequency (Hz). */
  frequency: number;
  /** Tone power (linear, full scale 1.0): main-lobe power / ENBW. */
  power: number;
  /** Tone power in dBFS (0 dBFS = power 1.0: a full-scale real sine reads -3.01 dBFS). */
  levelDbfs: number;
}

/** Marks bins within `halfWidth` of `centre` (display order; complex spectra wrap around). */
export function markLobe(mask: Uint8Array, spectrum: MeasuredSpectrum, centre: number, halfWidth: number): void {
  const n = mask.length;
  for (let d = -halfWidth; d <= halfWidth; d++) {
    let k = centre + d;
    if (spectrum.sampleType === 'complex') k = ((k % n) + n) % n;
    else if (k < 0) k = -k; // a real spectrum's lobe near 0 Hz folds back onto positive bins
    else if (k >= n) k = 2 * (n - 1) - k;
    if (k >= 0 && k < n) mask[k] = 1;
  }
}

/** Power (linear) summed over a lobe of `halfWidth` bins around `centre`, divided by ENBW. */
export function lobePower(spectrum: MeasuredSpectrum, centre: number, halfWidth: number): number {
  const mask = new Uint8Array(spectrum.power.length);
  markLobe(mask, spectrum, centre, halfWidth);
  let sum = 0;
  for (let k = 0; k < mask.length; k++) if (mask[k]) sum += spectrum.power[k];
  return sum / spectrum.enbwBins;
}

/** |W(offset)|^2 of the window's DTFT at `offset` bins (of an fftSize-point DFT) from its centre. */
function windowPowerAt(window: Float64Array, offset: number, fftSize: number): number {
  const step = (2 * Math.PI * offset) / fftSize;
  let re = 0;
  let im = 0;
  for (let n = 0; n < window.length; n++) {
    re += window[n] * Math.cos(step * n);
    im -= window[n] * Math.sin(step * n);
  }
  return re * re + im * im;
}

/**
 * Offset (bins, 0..0.5) of a tone from its peak bin towards the larger neighbour, found by matching
 * the neighbour-to-peak power ratio with the window's own DTFT (bisection). Exact for a lone tone
 * with any window, where a parabola fit is biased by the window shape (flat top: a tenth of a bin).
 */
function offsetFromRatio(window: Float64Array, fftSize: number, ratio: number): number {
  let lo = 0;
  let hi = 0.5;
  const at = (d: number) => windowPowerAt(window, 1 - d, fftSize) / windowPowerAt(window, d, fftSize);
  if (ratio <= at(lo)) return 0;
  if (ratio >= 1) return 0.5;
  for (let i = 0; i < 40; i++) {
    const mid = 0.5 * (lo + hi);
    if (at(mid) < ratio) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * The strongest tone: peak bin (outside the DC lobe unless `excludeDc` is false), frequency refined
 * between bins from the two largest bins and the window's shape, power = main-lobe power / ENBW.
 */
export function findTone(spectrum: MeasuredSpectrum, options: { excludeDc?: boolean } = {}): ToneReading {
  const { power } = spectrum;
  const excluded = new Uint8Array(power.length);
  if (options.excludeDc ?? true) markLobe(excluded, spectrum, spectrum.zeroBin, spectrum.mainLobeBins);
  let best = -1;
  for (let k = 0; k < power.length; k++) if (!excluded[k] && (best < 0 || power[k] > power[best])) best = k;
  if (best < 0) throw new RangeError('spectrum: no bins left outside the DC lobe to search for a tone');
  const step = spectrum.sampleRate / spectrum.fftSize;
  let frequency = spectrum.frequencies[best];
  if (best > 0 && best < power.length - 1 && power[best] > 0) {
    const side = power[best + 1] >= power[best - 1] ? 1 : -1;
    frequency += side * offsetFromRatio(spectrum.window, spectrum.fftSize, power[best + side] / power[best]) * step;
  }
  const p = lobePower(spectrum, best, spectrum.mainLobeBins);
  return { bin: best, frequency, power: p, levelDbfs: 10 * Math.log10(p) };
}
