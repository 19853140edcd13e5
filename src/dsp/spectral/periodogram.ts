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

/**
 * Receives the DFT of one windowed segment, interleaved (re, im), bins 0..bins-1 in natural order;
 * the consumer forms |X_k|^2 itself so power and accumulation take one pass. `spectrum` is reused
 * for the next segment.
 */
export type SegmentConsumer = (spectrum: Float64Array) => void;

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
  }

  /** Consume one block of samples (interleaved I/Q for complex); calls `consume` once per finished segment. */
  push(block: Float32Array, consume: SegmentConsumer): void {
    const per = this.sampleType === 'complex' ? 2 : 1;
    if (block.length % per !== 0) {
      throw new RangeError(`block: length ${block.length} is not a whole number of complex samples`);
    }
    const segmentValues = this.pending.length;
    const hopValues = this.hop * per;
    let pos = 0;
    // A segment begun in earlier blocks is completed through the pending buffer.
    while (this.filledValues > 0) {
      const take = Math.min(segmentValues - this.filledValues, block.length - pos);
      this.pending.set(block.subarray(pos, pos + take), this.filledValues);
      this.filledValues += take;
      pos += take;
      if (this.filledValues < segmentValues) {
        this.samplesIn += block.length / per;
        return;
      }
      this.windowFrom(this.pending, 0, this.window, this.fftSize);
      this.transformWindowed(consume);
      const nextStart = pos - (segmentValues - hopValues);
      if (nextStart >= 0) {
        this.filledValues = 0;
        pos = nextStart;
        break;
      }
      // The next segment still starts in earlier blocks: keep its head.
      this.pending.copyWithin(0, hopValues, segmentValues);
      this.filledValues = segmentValues - hopValues;
    }
    // Segments lying wholly inside the block are windowed straight from it, without a copy.
    while (pos + segmentValues <= block.length) {
      this.windowFrom(block, pos, this.window, this.fftSize);
      this.transformWindowed(consume);
      pos += hopValues;
    }
    this.pending.set(block.subarray(pos), 0);
    this.filledValues = block.length - pos;
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
    this.windowFrom(this.pending, 0, shortWindow, count);
    this.transformWindowed(consume);
  }

  /** windowed[0..count) = src[start..] x w, for `count` samples of the pending buffer or an input block. */
  private windowFrom(src: Float32Array | Float64Array, start: number, w: Float64Array, count: number): void {
    applyWindow(src, start, w, count, this.windowed, this.sampleType === 'complex');
  }

  private transformWindowed(consume: SegmentConsumer): void {
    if (this.sampleType === 'complex') this.plan.forward(this.windowed, this.spectrum);
    else this.plan.forwardReal(this.windowed, this.spectrum);
    this.segments++;
    consume(this.spectrum);
  }
}

/**
 * dst[0..count) = src[start..] x w for `count` samples (two values each when complex). One loop
 * serves the float64 pending buffer and float32 blocks: measured as fast as two monomorphic copies.
 */
function applyWindow(src: Float32Array | Float64Array, start: number, w: Float64Array, count: number, dst: Float64Array, complex: boolean): void {
  if (complex) {
    for (let k = 0, j = 0, s = start; k < count; k++, j += 2, s += 2) {
      const g = w[k];
      dst[j] = src[s] * g;
      dst[j + 1] = src[s + 1] * g;
    }
  } else {
    for (let k = 0, s = start; k < count; k++, s++) dst[k] = src[s] * w[k];
  }
}
