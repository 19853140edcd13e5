/**
 * Streaming segmentation for Welch and spectrogram: cuts a sample stream into overlapping
 * segments of fftSize samples (a segment may straddle any number of blocks), windows each one and
 * hands |X_k|^2 of its DFT to a consumer.
 *
 * Bins are in natural FFT order: complex input gives fftSize bins (DC at 0, negative frequencies in
 * the upper half); real input gives fftSize/2 + 1 bins (DC to Nyquist). Every buffer is allocated
 * once here; segments cost no allocation.
 */
import { assertFftSize, getFftPlan, type FftPlan } from '../fft/plan';

/** Receives the power of one segment; `power` is reused for the next segment. */
export type SegmentConsumer = (power: Float64Array) => void;

/** Sample types the spectral estimators accept (a real-pair stream must be combined first). */
export type SpectralSampleType = 'real' | 'complex';

/** Hop (samples between segment starts) for an FFT size and an overlap fraction 0 <= overlap < 1. */
export function hopSize(fftSize: number, overlap: number): number {
  if (!Number.isFinite(overlap) || overlap < 0 || overlap >= 1) {
    throw new RangeError(`overlap: must be a fraction from 0 to below 1, got ${overlap}`);
  }
  return Math.max(1, fftSize - Math.round(overlap * fftSize));
}

export class SegmentPeriodogram {
  readonly fftSize: number;
  readonly hop: number;
  readonly sampleType: SpectralSampleType;
  /** Bins per segment: fftSize (complex) or fftSize/2 + 1 (real). */
  readonly bins: number;
  /** Segments completed so far. */
  segments = 0;
  /** Samples consumed so far. */
  samplesIn = 0;

  private readonly window: Float64Array;
  private readonly plan: FftPlan;
  /** Raw samples of the segment being filled (values, 2 per complex sample). */
  private readonly pending: Float64Array;
  private filledValues = 0;
  private readonly windowed: Float64Array;
  private readonly spectrum: Float64Array;
  private readonly power: Float64Array;

  constructor(sampleType: SpectralSampleType, window: Float64Array, hop: number) {
    const n = window.length;
    assertFftSize(n, 'fftSize');
    if (n < 2) throw new RangeError('fftSize: must be at least 2');
    if (!Number.isInteger(hop) || hop < 1 || hop > n) throw new RangeError(`hop: must be an integer from 1 to ${n}, got ${hop}`);
    if (sampleType !== 'real' && sampleType !== 'complex') {
      throw new RangeError(`sampleType: spectra need real or complex samples, got "${String(sampleType)}"`);
    }
    this.fftSize = n;
    this.hop = hop;
    this.sampleType = sampleType;
    this.window = window;
    this.plan = getFftPlan(n);
    const per = sampleType === 'complex' ? 2 : 1;
    this.pending = new Float64Array(per * n);
    this.windowed = new Float64Array(per * n);
    this.spectrum = new Float64Array(2 * n);
    this.bins = sampleType === 'complex' ? n : n / 2 + 1;
    this.power = new Float64Array(this.bins);
  }

  /** Consume one block of samples (interleaved I/Q for complex); calls `consume` once per finished segment. */
  push(block: Float32Array, consume: SegmentConsumer): void {
    const per = this.sampleType === 'complex' ? 2 : 1;
    if (block.length % per !== 0) {
      throw new RangeError(`block: length ${block.length} is not a whole number of complex samples`);
    }
    const segmentValues = this.pending.length;
    let offset = 0;
    while (offset < block.length) {
      const take = Math.min(segmentValues - this.filledValues, block.length - offset);
      this.pending.set(block.subarray(offset, offset + take), this.filledValues);
      this.filledValues += take;
      offset += take;
      if (this.filledValues === segmentValues) {
        this.transformPending(consume);
        // Keep the overlapping tail as the start of the next segment.
        const hopValues = this.hop * per;
        this.pending.copyWithin(0, hopValues, segmentValues);
        this.filledValues = segmentValues - hopValues;
      }
    }
    this.samplesIn += block.length / per;
  }

  /** Samples held that have not yet completed a segment. */
  get pendingSamples(): number {
    return this.sampleType === 'complex' ? this.filledValues / 2 : this.filledValues;
  }

  /**
   * Transform the partial segment held (fewer than fftSize samples) with `shortWindow` of that many
   * samples, zero-padded to fftSize: used once when a whole stream is shorter than one segment.
   */
  flushShort(shortWindow: Float64Array, consume: SegmentConsumer): void {
    const count = this.pendingSamples;
    if (shortWindow.length !== count) throw new RangeError(`shortWindow: needs ${count} coefficients, got ${shortWindow.length}`);
    this.windowed.fill(0);
    this.windowInto(shortWindow, count);
    this.transformWindowed(consume);
  }

  private transformPending(consume: SegmentConsumer): void {
    this.windowInto(this.window, this.fftSize);
    this.transformWindowed(consume);
  }

  private windowInto(w: Float64Array, count: number): void {
    const src = this.pending;
    const dst = this.windowed;
    if (this.sampleType === 'complex') {
      for (let k = 0, j = 0; k < count; k++, j += 2) {
        const g = w[k];
        dst[j] = src[j] * g;
        dst[j + 1] = src[j + 1] * g;
      }
    } else {
      for (let k = 0; k < count; k++) dst[k] = src[k] * w[k];
    }
  }

  private transformWindowed(consume: SegmentConsumer): void {
    const spec = this.spectrum;
    if (this.sampleType === 'complex') this.plan.forward(this.windowed, spec);
    else this.plan.forwardReal(this.windowed, spec);
    const power = this.power;
    for (let k = 0, j = 0; k < this.bins; k++, j += 2) {
      const re = spec[j];
      const im = spec[j + 1];
      power[k] = re * re + im * im;
    }
    this.segments++;
    consume(power);
  }
}
