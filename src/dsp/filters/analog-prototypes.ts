import { cadd, cdiv, cmul, cprod, cscale, csub, cx, type Complex } from './complex';
import type { Zpk } from './zpk';

/** Analogue filter families the IIR designer knows. */
export type IirFamily = 'butterworth' | 'chebyshev1' | 'bessel';

/** Highest order the IIR designer accepts (band designs double it). */
export const MAX_IIR_ORDER = 20;

function checkOrder(order: number): void {
  if (!Number.isInteger(order) || order < 1 || order > MAX_IIR_ORDER) {
    throw new RangeError(`order: must be an integer from 1 to ${MAX_IIR_ORDER}, got ${order}`);
  }
}

/**
 * Butterworth low-pass prototype, -3.01 dB at 1 rad/s: poles evenly spaced on the left half of
 * the unit circle (S. Butterworth, "On the Theory of Filter Amplifiers", Wireless Engineer 7, 1930).
 */
export function butterworthPrototype(order: number): Zpk {
  checkOrder(order);
  const poles: Complex[] = [];
  for (let m = -order + 1; m < order; m += 2) {
    const theta = (Math.PI * m) / (2 * order);
    poles.push(cx(-Math.cos(theta), -Math.sin(theta)));
  }
  return { zeros: [], poles, gain: 1 };
}

/**
 * Chebyshev type I low-pass prototype with `rippleDb` pass-band ripple; the gain first leaves the
 * ripple band at 1 rad/s. DC gain is 0 dB for odd orders and -ripple for even ones (standard result).
 */
export function chebyshev1Prototype(order: number, rippleDb: number): Zpk {
  checkOrder(order);
  if (!(rippleDb > 0) || !Number.isFinite(rippleDb)) throw new RangeError(`ripple: must be > 0 dB, got ${rippleDb}`);
  const eps = Math.sqrt(Math.pow(10, rippleDb / 10) - 1);
  const mu = Math.asinh(1 / eps) / order;
  const poles: Complex[] = [];
  for (let m = -order + 1; m < order; m += 2) {
    const theta = (Math.PI * m) / (2 * order);
    // -sinh(mu + j theta)
    poles.push(cx(-Math.sinh(mu) * Math.cos(theta), -Math.cosh(mu) * Math.sin(theta)));
  }
  let gain = cprod(poles.map((p) => cx(-p.re, -p.im))).re;
  if (order % 2 === 0) gain /= Math.sqrt(1 + eps * eps);
  return { zeros: [], poles, gain };
}

/**
 * Bessel (maximally flat delay) low-pass prototype, phase-normalised: the poles are the roots of
 * the reverse Bessel polynomial theta_n(s) scaled by theta_n(0)^(-1/n), so the phase reaches half
 * its final value at 1 rad/s and the high-frequency asymptote matches a Butterworth of the same
 * order (scipy.signal.bessel's norm='phase').
 */
export function besselPrototype(order: number): Zpk {
  checkOrder(order);
  // theta_n(s) = sum_k a_k s^k, a_k = (2n - k)! / (2^(n-k) k! (n-k)!); a_n = 1.
  const n = order;
  const a: number[] = new Array(n + 1);
  a[n] = 1;
  for (let k = n - 1; k >= 0; k--) {
    // a_k / a_{k+1} = (2n - k) (k + 1) / (2 (n - k))
    a[k] = (a[k + 1] * (2 * n - k) * (k + 1)) / (2 * (n - k));
  }
  // Substituting s = r x with r = a_0^(1/n) gives a polynomial with c_0 = c_n = 1 whose roots x
  // are exactly the phase-normalised poles, all of modulus near 1: well conditioned for the search.
  const r = Math.pow(a[0], 1 / n);
  const c = a.map((ak, k) => (ak * Math.pow(r, k)) / a[0]);
  const poles = polynomialRoots(c);
  return { zeros: [], poles, gain: 1 };
}

function evalPoly(c: number[], x: Complex): Complex {
  let v = cx(c[c.length - 1]);
  for (let k = c.length - 2; k >= 0; k--) v = cadd(cmul(v, x), cx(c[k]));
  return v;
}

/**
 * All complex roots of sum_k c[k] x^k by the Durand-Kerner iteration, polished by Newton steps,
 * with conjugate pairs made exact. Meant for the small, well-scaled polynomials of filter design.
 */
export function polynomialRoots(c: number[]): Complex[] {
  const n = c.length - 1;
  const lead = c[n];
  const monic = c.map((v) => v / lead);
  const derivative = monic.slice(1).map((v, k) => v * (k + 1));
  let roots: Complex[] = [];
  for (let k = 0; k < n; k++) {
    // Off-axis starting points, not symmetric under conjugation, so the iteration can separate them.
    const angle = (2 * Math.PI * k) / n + 0.4;
    roots.push(cx(0.9 * Math.cos(angle), 0.9 * Math.sin(angle)));
  }
  for (let iteration = 0; iteration < 500; iteration++) {
    let change = 0;
    const next = roots.map((x, i) => {
      let denom = cx(1);
      for (let j = 0; j < n; j++) if (j !== i) denom = cmul(denom, csub(x, roots[j]));
      const step = cdiv(evalPoly(monic, x), denom);
      change = Math.max(change, Math.hypot(step.re, step.im));
      return csub(x, step);
    });
    roots = next;
    if (change < 1e-15) break;
  }
  roots = roots.map((x) => {
    let y = x;
    for (let k = 0; k < 3; k++) {
      const d = evalPoly(derivative, y);
      if (d.re === 0 && d.im === 0) break;
      y = csub(y, cdiv(evalPoly(monic, y), d));
    }
    return y;
  });
  return makeConjugatePairsExact(roots);
}

function makeConjugatePairsExact(roots: Complex[]): Complex[] {
  const out: Complex[] = [];
  const used = new Array(roots.length).fill(false);
  for (let i = 0; i < roots.length; i++) {
    if (used[i]) continue;
    used[i] = true;
    const x = roots[i];
    if (Math.abs(x.im) <= 1e-10 * Math.hypot(x.re, x.im)) {
      out.push(cx(x.re));
      continue;
    }
    let best = -1;
    let bestDistance = Infinity;
    for (let j = 0; j < roots.length; j++) {
      if (used[j]) continue;
      const d = Math.hypot(roots[j].re - x.re, roots[j].im + x.im);
      if (d < bestDistance) {
        bestDistance = d;
        best = j;
      }
    }
    if (best < 0) throw new Error('polynomial roots: complex root without a conjugate partner');
    used[best] = true;
    const re = (x.re + roots[best].re) / 2;
    const im = Math.abs(x.im - roots[best].im) / 2;
    out.push(cx(re, im), cx(re, -im));
  }
  return out;
}

/** Analogue low-pass prototype of a family (cut-off 1 rad/s as each family defines it). */
export function analogPrototype(family: IirFamily, order: number, rippleDb?: number): Zpk {
  if (family === 'butterworth') return butterworthPrototype(order);
  if (family === 'chebyshev1') {
    if (rippleDb === undefined) throw new RangeError('ripple: required for a Chebyshev type I filter (dB)');
    return chebyshev1Prototype(order, rippleDb);
  }
  if (family === 'bessel') return besselPrototype(order);
  throw new RangeError(`family: unknown IIR family "${String(family)}"`);
}

/** Gain of an analogue design at angular frequency w (rad/s), linear magnitude. */
export function analogMagnitude({ zeros, poles, gain }: Zpk, w: number): number {
  const s = cx(0, w);
  const num = cprod(zeros.map((z) => csub(s, z)));
  const den = cprod(poles.map((p) => csub(s, p)));
  const h = cscale(cdiv(num, den), gain);
  return Math.hypot(h.re, h.im);
}
