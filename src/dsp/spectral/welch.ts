/**
 * Streaming Welch power spectral density, matching scipy.signal.welch with detrend=False:
 * density scaling 1/(fs sum w^2), spectrum scaling 1/(sum w)^2; real input one-sided (all bins but
 * DC and Nyquist doubled), complex input two-sided with 0 Hz centred (fftshift order).
 * Averaging 'mean' is Welch's; 'max' keeps the highest power per bin over segments (max hold).
 */
import type { SpectrumResult } from '../types';
import { windowFunction, type WindowName } from '../windows/window-function';
import { hopSize, SegmentPeriodogram, type SpectralSampleType } from './periodogram';
import { checkedScaling, interpolatedPeak, levelUnit, powerToDb, segmentPowerScale, type SpectralScaling } from './levels';
import { assertSampleRate, spectralFrequencies, toDisplayOrder } from './axis';

/** Segment settings shared by the Welch estimate and the spectrogram. */
export interface SegmentAnalysisOptions {
  /** Samples per second (Hz). */
  sampleRate: number;
  sampleType: SpectralSampleType;
  /** Segment length and DFT size (samples, power of two >= 2). */
  fftSize: number;
  /** Window name (periodic) or explicit coefficients of length fftSize. Default 'hann'. */
  window?: WindowName | Float64Array;
  /** Kaiser beta when window is 'kaiser'. */
  beta?: number;
  /** Fraction of a segment shared with the next (0 to below 1). Default 0.5. */
  overlap?: number;
  /** 'density' (default, power/Hz) or 'spectrum' (power per bin). */
  scaling?: SpectralScaling;
}

/** Options of a Welch estimate. */
export interface WelchOptions extends SegmentAnalysisOptions {
  /** 'mean' (default) or 'max' (max hold). */
  averaging?: 'mean' | 'max';
}

/** Resolves a window option to periodic coefficients of `length` samples. */
export function resolveWindow(window: WindowName | Float64Array | undefined, length: number, beta?: number): Float64Array {
  if (window instanceof Float64Array) {
    if (window.length !== length) throw new RangeError(`window: needs ${length} coefficients, got ${window.length}`);
    return window;
  }
  return windowFunction(window ?? 'hann', length, { periodic: true, beta });
}

export class WelchAccumulator {
  readonly sampleRate: number;
  readonly sampleType: SpectralSampleType;
  readonly fftSize: number;
  readonly scaling: SpectralScaling;
  readonly averaging: 'mean' | 'max';
  private readonly windowName: WindowName | Float64Array | undefined;
  private readonly beta: number | undefined;
  private window: Float64Array;
  private readonly periodogram: SegmentPeriodogram;
  private readonly accumulated: Float64Array;
  private readonly addSegment: (spectrum: Float64Array) => void;
  private finished = false;

  constructor(options: WelchOptions) {
    assertSampleRate(options.sampleRate);
    this.sampleRate = options.sampleRate;
    this.sampleType = options.sampleType;
    this.fftSize = options.fftSize;
    this.scaling = checkedScaling(options.scaling);
    this.averaging = options.averaging ?? 'mean';
    if (this.averaging !== 'mean' && this.averaging !== 'max') throw new RangeError(`averaging: must be "mean" or "max", got "${String(this.averaging)}"`);
    this.windowName = options.window;
    this.beta = options.beta;
    this.window = resolveWindow(options.window, options.fftSize, options.beta);
    this.periodogram = new SegmentPeriodogram(options.sampleType, this.window, hopSize(options.fftSize, options.overlap ?? 0.5));
    const acc = new Float64Array(this.periodogram.bins);
    this.accumulated = acc;
    this.addSegment =
      this.averaging === 'mean'
        ? (spec) => {
            for (let k = 0, j = 0; k < acc.length; k++, j += 2) acc[k] += spec[j] * spec[j] + spec[j + 1] * spec[j + 1];
          }
        : (spec) => {
            for (let k = 0, j = 0; k < acc.length; k++, j += 2) {
              const p = spec[j] * spec[j] + spec[j + 1] * spec[j + 1];
              if (p > acc[k]) acc[k] = p;
            }
          };
  }

  /** Consume a block (interleaved I/Q for complex); segments may straddle blocks. */
  push(block: Float32Array): void {
    if (this.finished) throw new Error('WelchAccumulator: push after finish');
    this.periodogram.push(block, this.addSegment);
  }

  /**
   * End of stream. A stream shorter than one segment is analysed as a single segment of all its
   * samples with a window of that length, zero-padded to fftSize (scipy: nperseg = len(x)).
   */
  finish(): void {
    if (this.finished) return;
    this.finished = true;
    const held = this.periodogram.pendingSamples;
    if (this.periodogram.segments === 0 && held > 0) {
      this.window = typeof this.windowName === 'string' || this.windowName === undefined
        ? windowFunction(this.windowName ?? 'hann', held, { periodic: true, beta: this.beta })
        : this.windowName.subarray(0, held);
      this.periodogram.flushShort(this.window, this.addSegment);
    }
  }

  /** Window coefficients in use (shorter than fftSize after a short stream was finished). */
  get windowCoefficients(): Float64Array {
    return this.window;
  }

  /** Segments averaged so far. */
  get segments(): number {
    return this.periodogram.segments;
  }

  /** Resolution bandwidth (Hz): the window's equivalent noise bandwidth, fs sum(w^2)/(sum w)^2. */
  get resolutionBandwidth(): number {
    let s = 0;
    let s2 = 0;
    for (let k = 0; k < this.window.length; k++) {
      s += this.window[k];
      s2 += this.window[k] * this.window[k];
    }
    return (this.sampleRate * s2) / (s * s);
  }

  /** Frequencies (Hz) of the bins in display order: 0..fs/2 (real) or -fs/2..fs/2-fs/N (complex). */
  frequencies(): Float64Array {
    return spectralFrequencies(this.sampleType, this.fftSize, this.sampleRate);
  }

  /** Scaled linear power per bin in display order (power/Hz for density, power for spectrum). */
  power(): Float64Array {
    const segments = this.periodogram.segments;
    if (segments === 0) throw new RangeError('samples: no samples reached the spectrum; nothing to estimate');
    let scale = segmentPowerScale(this.window, this.sampleRate, this.scaling);
    if (this.averaging === 'mean') scale /= segments;
    const out = toDisplayOrder(this.accumulated, this.sampleType, this.fftSize);
    for (let k = 0; k < out.length; k++) out[k] *= scale;
    if (this.sampleType === 'real') {
      // One-sided: fold the negative frequencies onto the positive ones, except DC and Nyquist.
      for (let k = 1; k < out.length - 1; k++) out[k] *= 2;
    }
    return out;
  }

  /** The estimate as levels in dB (dBFS[/Hz], or dBm[/Hz] with a calibration offset) with its peak. */
  result(calibrationDb = 0): SpectrumResult {
    if (!Number.isFinite(calibrationDb)) throw new RangeError(`calibrationDb: must be a finite number of dB, got ${calibrationDb}`);
    const power = this.power();
    const freqs = this.frequencies();
    const levels = new Array<number>(power.length);
    for (let k = 0; k < power.length; k++) levels[k] = powerToDb(power[k], calibrationDb);
    const frequencies = Array.from(freqs);
    return {
      frequencies,
      levels,
      unit: levelUnit(this.scaling, calibrationDb),
      peak: interpolatedPeak(frequencies, levels),
      resolutionBandwidth: this.resolutionBandwidth,
      segments: this.segments,
    };
  }
}
