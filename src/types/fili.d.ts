/**
 * Types for fili 2.0.3 (CommonJS, ships none), covering the design functions STACK.md rates as
 * correct. Its runtime filters (FirFilter, simulate, multi-stage responses) are not declared on
 * purpose: the engine runs every filter with its own loops.
 */
declare module 'fili' {
  /** One biquad as fili designs it: H(z) = k (b0 + b1 z^-1 + b2 z^-2) / (1 + a[0] z^-1 + a[1] z^-2). */
  export interface FiliBiquad {
    k: number;
    a: [number, number];
    b: [number, number, number];
    z: [number, number];
  }

  export interface FiliCascadeParams {
    /** Number of biquads (filter order / 2), capped at 12 by fili. */
    order: number;
    /** Sample rate, Hz. */
    Fs: number;
    /** Cut-off, Hz. */
    Fc: number;
    characteristic: 'butterworth' | 'bessel';
    BW?: number;
    gain?: number;
    preGain?: boolean;
  }

  export interface FiliCalcCascades {
    lowpass(params: FiliCascadeParams): FiliBiquad[];
    highpass(params: FiliCascadeParams): FiliBiquad[];
    available(): string[];
  }

  export interface FiliFirCoeffs {
    /** Hamming windowed sinc, `order` + 1 taps, `Fc` (Hz) at the -6 dB point, unit DC gain. */
    lowpass(params: { order: number; Fs: number; Fc: number }): number[];
    /** Spectral inversion of `lowpass`; only even `order` is correct. */
    highpass(params: { order: number; Fs: number; Fc: number }): number[];
    /** Kaiser window band-pass from Fa to Fb (Hz), `Att` dB, `order` taps (made odd). */
    kbFilter(params: { order: number; Fs: number; Fa: number; Fb: number; Att: number }): number[];
    available(): string[];
  }

  // CommonJS: Node's ESM loader sees only a default export (the module.exports object).
  const fili: {
    FirCoeffs: new () => FiliFirCoeffs;
    CalcCascades: new () => FiliCalcCascades;
  };
  export default fili;
}
