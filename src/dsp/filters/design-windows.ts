/**
 * Symmetric windows for FIR design (length N, w[0] = w[N-1]), as filter design uses them; the
 * periodic windows for spectral analysis live in src/dsp/windows.
 */
import { besselI0 } from '../windows/bessel';

/** Window names accepted by the windowed-sinc design. */
export const DESIGN_WINDOWS = ['hamming', 'hann', 'blackman', 'blackman-harris', 'rectangular', 'kaiser'] as const;

export type DesignWindow = (typeof DESIGN_WINDOWS)[number];

// Cosine-sum coefficients: w[n] = sum_k (-1)^k a_k cos(2 pi k n / (N - 1)).
const COSINE_SUMS: Record<Exclude<DesignWindow, 'kaiser' | 'rectangular'>, number[]> = {
  hamming: [0.54, 0.46],
  hann: [0.5, 0.5],
  blackman: [0.42, 0.5, 0.08],
  // 4-term, 92 dB side lobes (Harris 1978, Table 1), the coefficients scipy's blackmanharris uses.
  'blackman-harris': [0.35875, 0.48829, 0.14128, 0.01168],
};

/** Symmetric window of `length` samples; `beta` is the Kaiser shape parameter. */
export function designWindow(name: DesignWindow, length: number, beta = 0): Float64Array {
  if (!Number.isInteger(length) || length < 1) throw new RangeError(`window length: must be an integer >= 1, got ${length}`);
  const w = new Float64Array(length);
  if (length === 1) {
    w[0] = 1;
    return w;
  }
  const m = length - 1;
  if (name === 'rectangular') {
    w.fill(1);
  } else if (name === 'kaiser') {
    if (!(beta >= 0) || !Number.isFinite(beta)) throw new RangeError(`beta: must be a finite number >= 0, got ${beta}`);
    const norm = besselI0(beta);
    for (let n = 0; n < length; n++) {
      const r = (2 * n) / m - 1;
      w[n] = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / norm;
    }
  } else {
    const a = COSINE_SUMS[name];
    if (!a) throw new RangeError(`window: unknown window "${String(name)}"`);
    for (let n = 0; n < length; n++) {
      let v = 0;
      for (let k = 0; k < a.length; k++) v += (k % 2 === 0 ? 1 : -1) * a[k] * Math.cos((2 * Math.PI * k * n) / m);
      w[n] = v;
    }
  }
  return w;
}
