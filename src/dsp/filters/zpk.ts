import { cabs, cadd, cdiv, cmul, cprod, cscale, csqrt, csub, cx, type Complex } from './complex';

/** A transfer function as zeros, poles and a real gain (analogue in s or digital in z). */
export interface Zpk {
  zeros: Complex[];
  poles: Complex[];
  gain: number;
}

/** Low-pass prototype (cut-off 1 rad/s) to low-pass with cut-off `wo` rad/s. */
export function lowpassToLowpass({ zeros, poles, gain }: Zpk, wo: number): Zpk {
  const degree = poles.length - zeros.length;
  return {
    zeros: zeros.map((z) => cscale(z, wo)),
    poles: poles.map((p) => cscale(p, wo)),
    gain: gain * Math.pow(wo, degree),
  };
}

const negate = (z: Complex): Complex => cx(-z.re, -z.im);

/** Low-pass prototype to high-pass with cut-off `wo` rad/s (s -> wo / s). */
export function lowpassToHighpass({ zeros, poles, gain }: Zpk, wo: number): Zpk {
  const degree = poles.length - zeros.length;
  const w = cx(wo);
  const ratio = cdiv(cprod(zeros.map(negate)), cprod(poles.map(negate)));
  return {
    zeros: [...zeros.map((z) => cdiv(w, z)), ...Array.from({ length: degree }, () => cx(0))],
    poles: poles.map((p) => cdiv(w, p)),
    gain: gain * ratio.re,
  };
}

// Each root r of the scaled prototype becomes r +- sqrt(r^2 - wo^2).
function splitRoots(roots: Complex[], wo: number): Complex[] {
  const plus: Complex[] = [];
  const minus: Complex[] = [];
  for (const r of roots) {
    const d = csqrt(csub(cmul(r, r), cx(wo * wo)));
    plus.push(cadd(r, d));
    minus.push(csub(r, d));
  }
  return [...plus, ...minus];
}

/** Low-pass prototype to band-pass centred on `wo` rad/s with bandwidth `bw` rad/s. */
export function lowpassToBandpass({ zeros, poles, gain }: Zpk, wo: number, bw: number): Zpk {
  const degree = poles.length - zeros.length;
  return {
    zeros: [...splitRoots(zeros.map((z) => cscale(z, bw / 2)), wo), ...Array.from({ length: degree }, () => cx(0))],
    poles: splitRoots(poles.map((p) => cscale(p, bw / 2)), wo),
    gain: gain * Math.pow(bw, degree),
  };
}

/** Low-pass prototype to band-stop centred on `wo` rad/s with bandwidth `bw` rad/s. */
export function lowpassToBandstop({ zeros, poles, gain }: Zpk, wo: number, bw: number): Zpk {
  const degree = poles.length - zeros.length;
  const half = cx(bw / 2);
  const ratio = cdiv(cprod(zeros.map(negate)), cprod(poles.map(negate)));
  return {
    zeros: [
      ...splitRoots(zeros.map((z) => cdiv(half, z)), wo),
      ...Array.from({ length: degree }, () => cx(0, wo)),
      ...Array.from({ length: degree }, () => cx(0, -wo)),
    ],
    poles: splitRoots(poles.map((p) => cdiv(half, p)), wo),
    gain: gain * ratio.re,
  };
}

/**
 * Bilinear transform s = 2 fs (z - 1) / (z + 1) of an analogue design; the zeros at infinity land
 * on z = -1 (Nyquist). `fs` is the sample rate the analogue frequencies were pre-warped for.
 */
export function bilinear({ zeros, poles, gain }: Zpk, fs: number): Zpk {
  const degree = poles.length - zeros.length;
  const fs2 = cx(2 * fs);
  const map = (s: Complex): Complex => cdiv(cadd(fs2, s), csub(fs2, s));
  const ratio = cdiv(cprod(zeros.map((z) => csub(fs2, z))), cprod(poles.map((p) => csub(fs2, p))));
  return {
    zeros: [...zeros.map(map), ...Array.from({ length: degree }, () => cx(-1))],
    poles: poles.map(map),
    gain: gain * ratio.re,
  };
}

/** Largest pole modulus (digital): below 1 means stable. */
export function largestPoleRadius(poles: Complex[]): number {
  return poles.reduce((m, p) => Math.max(m, cabs(p)), 0);
}
