/**
 * Window functions for spectral analysis (periodic, "DFT-even") and filter design (symmetric).
 *
 * A periodic window of length N is the symmetric window of length N + 1 without its last point: its
 * DFT has the textbook side-lobe behaviour at bin spacing, which is what CG, ENBW and scalloping
 * figures assume. A symmetric window has w[n] = w[N-1-n], which keeps linear phase in FIR design.
 */
import { besselI0 } from './bessel';

/** Window names known to the engine. */
export const WINDOW_NAMES = ['rectangular', 'hann', 'hamming', 'blackman', 'blackman-harris', 'flattop', 'kaiser'] as const;
export type WindowName = (typeof WINDOW_NAMES)[number];

/** Options of windowFunction. */
export interface WindowOptions {
  /** true: periodic (DFT-even) for spectra; false: symmetric for filter design. Default true. */
  periodic?: boolean;
  /** Kaiser shape parameter beta (only for 'kaiser'; default 8.6, side lobes near -69 dB). */
  beta?: number;
}

/**
 * Cosine-sum coefficients a_k of w[n] = sum_k (-1)^k a_k cos(2 pi k n / M).
 * Values are the published ones: Hann, Hamming, Blackman and 4-term Blackman-Harris (-92 dB) from
 * F. J. Harris, Proc. IEEE 66(1), 1978; flat top from D'Antona and Ferrero, 2006, p. 70.
 */
const COSINE_SUM: Record<Exclude<WindowName, 'kaiser'>, readonly number[]> = {
  rectangular: [1],
  hann: [0.5, 0.5],
  hamming: [0.54, 0.46],
  blackman: [0.42, 0.5, 0.08],
  'blackman-harris': [0.35875, 0.48829, 0.14128, 0.01168],
  flattop: [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368],
};

/** Default Kaiser beta when none is given. */
export const DEFAULT_KAISER_BETA = 8.6;

/** True when `name` is a window name the engine knows. */
export function isWindowName(name: string): name is WindowName {
  return (WINDOW_NAMES as readonly string[]).includes(name);
}

/** Window `name` of `length` samples as a new Float64Array (peak 1 for odd symmetric lengths). */
export function windowFunction(name: WindowName, length: number, options: WindowOptions = {}): Float64Array {
  if (!isWindowName(name)) throw new RangeError(`window: unknown window "${String(name)}"; use one of ${WINDOW_NAMES.join(', ')}`);
  if (!Number.isInteger(length) || length < 1) throw new RangeError(`length: must be an integer >= 1, got ${length}`);
  const periodic = options.periodic ?? true;
  const w = new Float64Array(length);
  if (length === 1) {
    w[0] = 1;
    return w;
  }
  // Span M of the cosine argument: the symmetric window of length N + 1 (periodic) or N.
  const span = periodic ? length : length - 1;
  if (name === 'kaiser') {
    const beta = options.beta ?? DEFAULT_KAISER_BETA;
    if (!Number.isFinite(beta) || beta < 0) throw new RangeError(`beta: must be a finite number >= 0, got ${beta}`);
    const norm = besselI0(beta);
    for (let n = 0; n < length; n++) {
      const r = (2 * n) / span - 1;
      w[n] = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / norm;
    }
    return w;
  }
  const a = COSINE_SUM[name];
  for (let n = 0; n < length; n++) {
    const phase = (2 * Math.PI * n) / span;
    let v = 0;
    for (let k = 0; k < a.length; k++) v += (k % 2 === 0 ? a[k] : -a[k]) * Math.cos(k * phase);
    w[n] = v;
  }
  return w;
}
