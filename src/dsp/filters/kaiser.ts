import type { BandEdges, FilterResponse } from './band-edges';
import { MAX_FIR_TAPS, windowedSincTaps } from './windowed-sinc';

/**
 * Kaiser window shape parameter for a stop-band attenuation A (dB): Oppenheim and Schafer,
 * "Discrete-Time Signal Processing", 3rd ed., section 7.5.3 (after J. F. Kaiser, 1974).
 */
export function kaiserBeta(attenuationDb: number): number {
  const a = attenuationDb;
  if (a > 50) return 0.1102 * (a - 8.7);
  if (a >= 21) return 0.5842 * Math.pow(a - 21, 0.4) + 0.07886 * (a - 21);
  return 0;
}

/**
 * Number of taps for attenuation A (dB) and transition width (Hz) at a sample rate (Hz):
 * N = (A - 7.95) / (2.285 dw) + 1 rounded up, dw in rad/sample (Kaiser's estimate, as scipy's
 * kaiserord computes it).
 */
export function kaiserLength(attenuationDb: number, transition: number, sampleRate: number): number {
  if (!(attenuationDb >= 8)) {
    // Kaiser's length estimate is only valid from about 8 dB up.
    throw new RangeError(`attenuation: must be >= 8 dB for a Kaiser design, got ${attenuationDb}`);
  }
  if (!(transition > 0) || transition >= sampleRate / 2) {
    throw new RangeError(`transition: must be > 0 Hz and below the Nyquist frequency ${sampleRate / 2} Hz, got ${transition}`);
  }
  const dw = (2 * Math.PI * transition) / sampleRate;
  return Math.ceil((attenuationDb - 7.95) / (2.285 * dw) + 1);
}

/**
 * Attenuation (dB) a Kaiser design must reach so that both the pass-band ripple (peak-to-peak dB)
 * and the stop-band attenuation (dB) hold: the window method gives equal deviations in both bands,
 * so the smaller of delta_p = (10^(Rp/20) - 1) / (10^(Rp/20) + 1) and delta_s = 10^(-As/20) rules
 * (common practice).
 */
export function kaiserDesignAttenuation(attenuationDb: number, rippleDb?: number): number {
  if (rippleDb === undefined) return attenuationDb;
  if (!(rippleDb > 0)) throw new RangeError(`ripple: must be > 0 dB, got ${rippleDb}`);
  const g = Math.pow(10, rippleDb / 20);
  const deltaPass = (g - 1) / (g + 1);
  return Math.max(attenuationDb, -20 * Math.log10(deltaPass));
}

export interface KaiserSpec extends BandEdges {
  response: FilterResponse;
  /** Stop-band attenuation, dB. */
  attenuation: number;
  /** Pass-band ripple, peak-to-peak dB (optional). */
  ripple?: number;
  /** Transition width, Hz, centred on each edge. */
  transition: number;
  /** Hz. */
  sampleRate: number;
}

/** A Kaiser-window FIR design: its taps, tap count and beta. */
export interface KaiserDesign {
  taps: Float64Array;
  beta: number;
  attenuation: number;
}

/**
 * Kaiser-window FIR from attenuation (dB), optional ripple (dB) and transition width (Hz); each
 * edge is the -6 dB point in the middle of its transition band. High-pass and band-stop lengths
 * are made odd (an even linear-phase filter has a zero at Nyquist).
 */
export function kaiserTaps(spec: KaiserSpec): KaiserDesign {
  const attenuation = kaiserDesignAttenuation(spec.attenuation, spec.ripple);
  let taps = kaiserLength(attenuation, spec.transition, spec.sampleRate);
  if ((spec.response === 'highpass' || spec.response === 'bandstop') && taps % 2 === 0) taps += 1;
  if (taps > MAX_FIR_TAPS) {
    throw new RangeError(`transition: ${spec.transition} Hz needs ${taps} taps, more than ${MAX_FIR_TAPS}; widen it`);
  }
  const beta = kaiserBeta(attenuation);
  return { taps: windowedSincTaps({ ...spec, taps, window: 'kaiser', beta }), beta, attenuation };
}
