/**
 * The spectrum readouts work on: a mean Welch estimate with 'spectrum' scaling (a bin-centred
 * tone reads its power in its bin) plus what the window does to tones and noise.
 *
 * Power summed over a tone's main lobe and divided by the window's ENBW (bins) gives the tone's
 * power whatever its position between bins (common practice), so levels need no scalloping
 * correction; noise power per bin is noise power x ENBW / N for the same reason.
 */
import { WelchAccumulator } from '../spectral/welch';
import type { SpectralSampleType } from '../spectral/periodogram';
import { enbwBins, mainLobeHalfWidthBins } from '../windows/window-metrics';
import { DEFAULT_KAISER_BETA, type WindowName } from '../windows/window-function';

export interface MeasuredSpectrum {
  /** Linear power per bin ('spectrum' scaling), display order (0 Hz centred for complex). */
  power: Float64Array;
  /** Bin frequencies (Hz), display order. */
  frequencies: Float64Array;
  sampleRate: number;
  fftSize: number;
  sampleType: SpectralSampleType;
  /** Equivalent noise bandwidth of the window (bins). */
  enbwBins: number;
  /** Bins either side of a tone's peak that belong to its main lobe. */
  mainLobeBins: number;
  /** Index of 0 Hz in `power`. */
  zeroBin: number;
  /** Periodic window coefficients used for every segment (fftSize values). */
  window: Float64Array;
}

/** Options of a measuring spectrum. */
export interface MeasureSpectrumOptions {
  sampleRate: number;
  sampleType: SpectralSampleType;
  /** Segment length and DFT size (samples, power of two). Default 8192. */
  fftSize?: number;
  /** Default 'blackman-harris': low leakage keeps spurs and noise apart from the tone. */
  window?: WindowName;
  beta?: number;
  /** Default 0.5. */
  overlap?: number;
}

/** A Welch accumulator set up for readouts (mean averaging, 'spectrum' scaling). */
export function createMeasuringWelch(options: MeasureSpectrumOptions): WelchAccumulator {
  return new WelchAccumulator({
    sampleRate: options.sampleRate,
    sampleType: options.sampleType,
    fftSize: options.fftSize ?? 8192,
    window: options.window ?? 'blackman-harris',
    beta: options.beta,
    overlap: options.overlap ?? 0.5,
    scaling: 'spectrum',
    averaging: 'mean',
  });
}

/** The measured spectrum of a finished measuring Welch accumulator. */
export function measuredSpectrum(welch: WelchAccumulator, window: WindowName = 'blackman-harris', beta?: number): MeasuredSpectrum {
  if (welch.scaling !== 'spectrum' || welch.averaging !== 'mean') {
    throw new RangeError('welch: readouts need mean averaging with "spectrum" scaling');
  }
  welch.finish();
  // A stream shorter than one segment was analysed with a shorter, zero-padded window: ENBW (in
  // fftSize bins) and the main lobe widen by fftSize / window length.
  const w = welch.windowCoefficients;
  const stretch = welch.fftSize / w.length;
  return {
    power: welch.power(),
    frequencies: welch.frequencies(),
    sampleRate: welch.sampleRate,
    fftSize: welch.fftSize,
    sampleType: welch.sampleType,
    enbwBins: enbwBins(w) * stretch,
    mainLobeBins: Math.ceil(mainLobeHalfWidthBins(window, beta ?? DEFAULT_KAISER_BETA) * stretch),
    zeroBin: welch.sampleType === 'complex' ? welch.fftSize / 2 : 0,
    window: w,
  };
}

/** Measured spectrum of a whole block of samples (interleaved I/Q for complex). */
export function measureSpectrumOf(samples: Float32Array, options: MeasureSpectrumOptions): MeasuredSpectrum {
  const welch = createMeasuringWelch(options);
  welch.push(samples);
  welch.finish();
  return measuredSpectrum(welch, options.window ?? 'blackman-harris', options.beta);
}

/** Display-order bin index nearest to `frequency` (Hz), folded into the spectrum's range. */
export function binOfFrequency(spectrum: MeasuredSpectrum, frequency: number): number {
  const { fftSize, sampleRate, sampleType } = spectrum;
  let k = Math.round((frequency / sampleRate) * fftSize) % fftSize;
  if (k < 0) k += fftSize;
  if (sampleType === 'complex') return (k + fftSize / 2) % fftSize;
  // A real spectrum shows |f| folded into 0..fs/2.
  return k > fftSize / 2 ? fftSize - k : k;
}
