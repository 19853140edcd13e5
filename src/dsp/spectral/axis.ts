/** Frequency axes and bin order shared by the spectral estimators. */
import type { SpectralSampleType } from './periodogram';

/** Throws a RangeError unless `sampleRate` is a finite number > 0 (Hz). */
export function assertSampleRate(sampleRate: number): void {
  if (!Number.isFinite(sampleRate) || sampleRate <= 0) throw new RangeError(`sampleRate: must be a finite number > 0 Hz, got ${sampleRate}`);
}

/** Bin frequencies (Hz) in display order: k fs/N for k = 0..N/2 (real), k = -N/2..N/2-1 (complex). */
export function spectralFrequencies(sampleType: SpectralSampleType, fftSize: number, sampleRate: number): Float64Array {
  const step = sampleRate / fftSize;
  if (sampleType === 'real') {
    const out = new Float64Array(fftSize / 2 + 1);
    for (let k = 0; k < out.length; k++) out[k] = k * step;
    return out;
  }
  const out = new Float64Array(fftSize);
  const half = fftSize / 2;
  for (let k = 0; k < fftSize; k++) out[k] = (k - half) * step;
  return out;
}

/** Copy of natural-order bins in display order: unchanged for real, fftshift (0 Hz centred) for complex. */
export function toDisplayOrder(bins: Float64Array, sampleType: SpectralSampleType, fftSize: number, out?: Float64Array): Float64Array {
  const result = out ?? new Float64Array(bins.length);
  if (sampleType === 'real') {
    result.set(bins);
    return result;
  }
  const half = fftSize / 2;
  result.set(bins.subarray(half, fftSize), 0);
  result.set(bins.subarray(0, half), half);
  return result;
}
