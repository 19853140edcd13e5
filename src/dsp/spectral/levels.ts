/**
 * Linear power -> dB levels and the interpolated peak of a plotted spectrum.
 *
 * dBFS: 0 dBFS is a power of 1.0 (full scale 1.0): a full-scale complex tone reads 0 dBFS, a
 * full-scale real sine (power A^2/2) reads -3.01 dBFS, as scipy.signal.welch's scaling gives.
 * A calibration offset (dB) turns dBFS into dBm.
 */
import type { SpectrumResult } from '../types';

/** Power scaling of a spectrum estimate. */
export type SpectralScaling = 'density' | 'spectrum';

/** The scaling asked for, 'density' when absent; anything else is a RangeError naming the field. */
export function checkedScaling(scaling: SpectralScaling | undefined): SpectralScaling {
  const chosen = scaling ?? 'density';
  if (chosen !== 'density' && chosen !== 'spectrum') throw new RangeError(`scaling: must be "density" or "spectrum", got "${String(chosen)}"`);
  return chosen;
}

/**
 * Scale from |X_k|^2 of one windowed segment to power: 1/(fs sum w^2) for density (per Hz, fs in
 * Hz), 1/(sum w)^2 for spectrum (per bin), as scipy.signal.welch scales.
 */
export function segmentPowerScale(window: Float64Array, sampleRate: number, scaling: SpectralScaling): number {
  let s = 0;
  let s2 = 0;
  for (let k = 0; k < window.length; k++) {
    s += window[k];
    s2 += window[k] * window[k];
  }
  return scaling === 'density' ? 1 / (sampleRate * s2) : 1 / (s * s);
}

/** Lowest level reported: a power of exactly 0 maps here instead of -Infinity (JSON has no -Infinity). */
export const LEVEL_FLOOR_DB = -300;

/** 10 log10(power) + calibrationDb, floored at LEVEL_FLOOR_DB + calibrationDb. */
export function powerToDb(power: number, calibrationDb = 0): number {
  return (power > 0 ? Math.max(LEVEL_FLOOR_DB, 10 * Math.log10(power)) : LEVEL_FLOOR_DB) + calibrationDb;
}

/** Unit of levels for a scaling and calibration: dBFS[/Hz], or dBm[/Hz] when calibrationDb is non-zero. */
export function levelUnit(scaling: SpectralScaling, calibrationDb: number): SpectrumResult['unit'] {
  const base = calibrationDb !== 0 ? 'dBm' : 'dBFS';
  return scaling === 'density' ? (`${base}/Hz` as const) : base;
}

/**
 * Highest level with its frequency refined by a parabola through the peak and its two neighbours
 * (on dB values, i.e. Gaussian interpolation on the magnitude); edge bins are not interpolated.
 */
export function interpolatedPeak(frequencies: ArrayLike<number>, levels: ArrayLike<number>): { frequency: number; level: number } {
  const n = levels.length;
  if (n === 0 || frequencies.length !== n) throw new RangeError('levels: need one level per frequency and at least one bin');
  let best = 0;
  for (let k = 1; k < n; k++) if (levels[k] > levels[best]) best = k;
  if (best === 0 || best === n - 1) return { frequency: frequencies[best], level: levels[best] };
  const a = levels[best - 1];
  const b = levels[best];
  const c = levels[best + 1];
  const curvature = a - 2 * b + c;
  if (!(curvature < 0)) return { frequency: frequencies[best], level: b };
  const delta = (0.5 * (a - c)) / curvature;
  const step = frequencies[best + 1] - frequencies[best];
  return { frequency: frequencies[best] + delta * step, level: b - 0.25 * (a - c) * delta };
}
