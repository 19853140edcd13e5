/**
 * The quick look's computation on the head of a capture, pure and synchronous so it runs the same
 * in the Web Worker and in tests: decode the bytes with the formats code, then the engine's Welch
 * spectrum, spectrogram, min/max trace and blind balance estimate. A two-channel capture is read
 * as I + jQ (channel 0 = I, channel 1 = Q), the layout of a dual ADC on a quadrature demodulator.
 * Imports are relative: the worker bundle does not see the `@/` alias.
 */
import { parseDatatype } from '../../dsp/formats/datatype';
import { SampleDecoder } from '../../dsp/formats/sample-decoder';
import { WelchAccumulator } from '../../dsp/spectral/welch';
import { SpectrogramAccumulator } from '../../dsp/spectral/spectrogram';
import { MinMaxTraceReducer, reduceSpectrumMax } from '../../dsp/spectral/trace-reducer';
import { estimateIqImbalance } from '../../dsp/measure/iq-imbalance';
import { imageRejectionDb } from '../../dsp/measure/image-rejection';
import { dcLevelDbfs } from '../../dsp/measure/sample-moments';
import { ClippingCounter } from '../../dsp/measure/clipping';
import type { SpectrogramResult, SpectrumResult, TraceResult } from '../../dsp/types';
import type { Capture } from '../../contracts/capture';

/** Samples the quick look reads from the start of a capture: 2^18. */
export const QUICK_LOOK_SAMPLES = 2 ** 18;

/** What the quick look needs to know about the bytes. */
/** The head's bytes and how to read them (the capture's datatype, layout and rate). */
export type QuickLookInput = Pick<Capture, 'datatype' | 'layout' | 'sampleRate'> & {
  bytes: ArrayBuffer;
  /** Most points of the spectrum plot (default 2048). */
  spectrumColumns?: number;
  /** Most columns of the I/Q trace (default 2048). */
  traceColumns?: number;
};

/** Balance of the head: DC offsets (full scale 1.0 and dBFS); gain and phase only for I/Q. */
export interface BalanceEstimate {
  dcI: number;
  dcIDbfs: number;
  dcQ: number | null;
  dcQDbfs: number | null;
  /** 20 log10 of I's amplitude over Q's (dB, Q the reference: + when I is stronger); null for a real capture. */
  gainImbalanceDb: number | null;
  /** Phase error (degrees); null for a real capture. */
  phaseImbalanceDeg: number | null;
  /** Image rejection the gain and phase error imply (dB); Infinity when perfectly balanced. */
  imageRejectionDb: number | null;
}

/** Overload of the head: samples with |x| >= 1 (full scale) per channel and the crest factor. */
export interface ClippingEstimate {
  /** Clipped samples per channel: [I, Q] for complex and two-channel heads, [x] for real. */
  clipped: number[];
  /** 20 log10(peak / RMS) in dB (of |I + jQ| for complex); null without signal. */
  crestFactorDb: number | null;
}

export interface QuickLookResult {
  /** Samples analysed. */
  samples: number;
  sampleRate: number;
  /** How the head was analysed: real, or complex (complex and two-channel captures). */
  sampleType: 'real' | 'complex';
  /** Welch PSD in dBFS/Hz, reduced to at most spectrumColumns points (peak kept per column). */
  spectrum: SpectrumResult;
  spectrumFftSize: number;
  spectrogram: SpectrogramResult;
  spectrogramFftSize: number;
  /** Min/max per column; channels [I, Q] for complex and two-channel, [x] for real. */
  trace: TraceResult;
  balance: BalanceEstimate;
  /** Clipping: any clipped sample makes the levels and the balance estimate unreliable. */
  clipping: ClippingEstimate;
  /** Time spent decoding and analysing (ms). */
  elapsedMs: number;
}

/** Largest power of two <= n, kept within [low, high]. */
function powerOfTwoWithin(n: number, low: number, high: number): number {
  const p = 2 ** Math.floor(Math.log2(Math.max(1, n)));
  return Math.min(high, Math.max(low, p));
}

/** Decode and analyse the head of a capture (bytes from sample 0, whole samples). */
export function analyseHead(input: QuickLookInput): QuickLookResult {
  const started = performance.now();
  const datatype = parseDatatype(input.datatype);
  const decoder = new SampleDecoder(datatype, input.layout);
  const values = decoder.decode(new Uint8Array(input.bytes));
  // A two-channel block [ch0, ch1, ch0, ch1...] is exactly an interleaved I/Q block.
  const sampleType: 'real' | 'complex' = input.layout === 'real' ? 'real' : 'complex';
  const samples = sampleType === 'real' ? values.length : values.length / 2;
  if (samples < 2) throw new RangeError(`head: ${samples} sample(s) are too few for a quick look (need at least 2)`);

  // About 64 segments for the spectrum and 256+ rows for the spectrogram on a 2^18 head.
  const spectrumFftSize = powerOfTwoWithin(samples / 32, 16, 4096);
  const spectrogramFftSize = powerOfTwoWithin(samples / 256, 16, 512);
  const welch = new WelchAccumulator({ sampleRate: input.sampleRate, sampleType, fftSize: spectrumFftSize, window: 'hann' });
  const spectrogram = new SpectrogramAccumulator({ sampleRate: input.sampleRate, sampleType, fftSize: spectrogramFftSize, window: 'hann', maxRows: 256 });
  const trace = new MinMaxTraceReducer({ sampleRate: input.sampleRate, sampleType: input.layout === 'real' ? 'real' : 'complex', maxColumns: input.traceColumns ?? 2048 });
  welch.push(values);
  welch.finish();
  spectrogram.push(values);
  trace.push(values);
  const clipping = new ClippingCounter(sampleType === 'complex');
  clipping.push(values);

  const fullSpectrum = welch.result();
  const reduced = reduceSpectrumMax(fullSpectrum.frequencies, fullSpectrum.levels, input.spectrumColumns ?? 2048);
  const spectrum: SpectrumResult = { ...fullSpectrum, frequencies: reduced.frequencies, levels: reduced.levels };

  return {
    samples,
    sampleRate: input.sampleRate,
    sampleType,
    spectrum,
    spectrumFftSize,
    spectrogram: spectrogram.result(),
    spectrogramFftSize,
    trace: trace.result(),
    balance: balanceOf(values, sampleType),
    clipping: { clipped: [...clipping.clipped], crestFactorDb: clipping.crestFactorDb() },
    elapsedMs: performance.now() - started,
  };
}

function balanceOf(values: Float32Array, sampleType: 'real' | 'complex'): BalanceEstimate {
  if (sampleType === 'real') {
    let sum = 0;
    for (let k = 0; k < values.length; k++) sum += values[k];
    const dcI = sum / values.length;
    return { dcI, dcIDbfs: dcLevelDbfs(dcI), dcQ: null, dcQDbfs: null, gainImbalanceDb: null, phaseImbalanceDeg: null, imageRejectionDb: null };
  }
  const estimate = estimateIqImbalance(values);
  return {
    dcI: estimate.dcI,
    dcIDbfs: dcLevelDbfs(estimate.dcI),
    dcQ: estimate.dcQ,
    dcQDbfs: dcLevelDbfs(estimate.dcQ),
    gainImbalanceDb: 20 * Math.log10(estimate.gainRatio),
    phaseImbalanceDeg: (estimate.phaseRad * 180) / Math.PI,
    imageRejectionDb: imageRejectionDb(estimate.gainRatio, estimate.phaseRad),
  };
}

/** The quick look's overload warning in words, or null when no sample reached full scale. */
export function clippingWarning(clipping: ClippingEstimate, sampleType: 'real' | 'complex', samples: number): string | null {
  if (!clipping.clipped.some((c) => c > 0)) return null;
  const names = sampleType === 'real' ? [''] : ['I', 'Q'];
  const counts = clipping.clipped
    .map((c, k) => `${names[k] ? `${names[k]} ` : ''}${c.toLocaleString('en')} of ${samples.toLocaleString('en')}`)
    .join(', ');
  const crest = clipping.crestFactorDb === null ? '' : ` Crest factor ${clipping.crestFactorDb.toFixed(2)} dB.`;
  return `Clipping: samples at or beyond full scale (|x| >= 1): ${counts}. Levels, spectrum and balance figures of this head are unreliable.${crest}`;
}
