import { cabs, cmul, cx, type Complex } from './complex';
import type { Zpk } from './zpk';

/**
 * Second-order sections, one row per section: [b0, b1, b2, a0, a1, a2] with a0 = 1, applied in
 * order. The same layout as scipy.signal's `sos` arrays.
 */
export type SosMatrix = number[][];

const REAL_TOLERANCE = 100 * Number.EPSILON;

// Split into one member (positive imaginary part) of each conjugate pair, and the real values.
function conjugatePairsAndReals(values: Complex[]): { pairs: Complex[]; reals: Complex[] } {
  const sorted = [...values].sort((a, b) => a.re - b.re || Math.abs(a.im) - Math.abs(b.im));
  const reals: Complex[] = [];
  const upper: Complex[] = [];
  const lower: Complex[] = [];
  for (const v of sorted) {
    if (Math.abs(v.im) <= REAL_TOLERANCE * cabs(v)) reals.push(cx(v.re));
    else if (v.im > 0) upper.push(v);
    else lower.push(v);
  }
  if (upper.length !== lower.length) throw new Error('zpk to sos: complex values are not in conjugate pairs');
  const pairs = upper.map((u) => {
    let best = 0;
    for (let j = 1; j < lower.length; j++) {
      if (Math.hypot(lower[j].re - u.re, lower[j].im + u.im) < Math.hypot(lower[best].re - u.re, lower[best].im + u.im)) best = j;
    }
    const l = lower.splice(best, 1)[0];
    return cx((u.re + l.re) / 2, (u.im - l.im) / 2);
  });
  return { pairs, reals };
}

const isReal = (v: Complex): boolean => v.im === 0;

// Index of the value nearest to `target` among those of the requested kind.
function nearestIndex(values: Complex[], target: Complex, kind: 'real' | 'complex' | 'any'): number {
  let best = -1;
  let bestDistance = Infinity;
  values.forEach((v, i) => {
    if (kind === 'real' && !isReal(v)) return;
    if (kind === 'complex' && isReal(v)) return;
    const d = cabs(cx(v.re - target.re, v.im - target.im));
    if (d < bestDistance) {
      bestDistance = d;
      best = i;
    }
  });
  if (best < 0) throw new Error(`zpk to sos: no ${kind} zero left to pair`);
  return best;
}

// The pole closest to the unit circle: it has the highest Q and goes into the last section.
function worstIndex(values: Complex[], onlyReal = false): number {
  let best = -1;
  let bestDistance = Infinity;
  values.forEach((v, i) => {
    if (onlyReal && !isReal(v)) return;
    const d = Math.abs(1 - cabs(v));
    if (d < bestDistance) {
      bestDistance = d;
      best = i;
    }
  });
  return best;
}

// Real coefficients of prod (x - r), highest power first, placed right-aligned in 3 slots.
function sectionPolynomial(roots: Complex[]): number[] {
  let poly: Complex[] = [cx(1)];
  for (const r of roots) {
    const next: Complex[] = [...poly.map((c) => ({ ...c })), cx(0)];
    for (let i = 0; i < poly.length; i++) {
      const t = cmul(poly[i], r);
      next[i + 1] = cx(next[i + 1].re - t.re, next[i + 1].im - t.im);
    }
    poly = next;
  }
  const real = poly.map((c) => c.re);
  return [...new Array(3 - real.length).fill(0), ...real];
}

function section(zeros: Complex[], poles: Complex[]): number[] {
  return [...sectionPolynomial(zeros), ...sectionPolynomial(poles)];
}

/**
 * Pair the zeros and poles of a digital design into second-order sections: the pole nearest the
 * unit circle is taken first, joined with its conjugate (or the next such real pole) and with the
 * nearest zeros, and placed last in the cascade; the gain goes into the first section. This is the
 * "nearest" pairing of scipy.signal.zpk2sos, so sections match SciPy's one for one.
 */
export function zpkToSos(design: Zpk): SosMatrix {
  let zerosIn = [...design.zeros];
  let polesIn = [...design.poles];
  if (zerosIn.length === 0 && polesIn.length === 0) return [[design.gain, 0, 0, 1, 0, 0]];
  while (polesIn.length < zerosIn.length) polesIn.push(cx(0));
  while (zerosIn.length < polesIn.length) zerosIn.push(cx(0));
  const sectionCount = Math.floor((polesIn.length + 1) / 2);
  if (polesIn.length % 2 === 1) {
    polesIn.push(cx(0));
    zerosIn.push(cx(0));
  }
  const zs = conjugatePairsAndReals(zerosIn);
  const ps = conjugatePairsAndReals(polesIn);
  let z = [...zs.pairs, ...zs.reals];
  let p = [...ps.pairs, ...ps.reals];
  const take = (list: Complex[], i: number): [Complex, Complex[]] => [list[i], list.filter((_, j) => j !== i)];

  const sos: SosMatrix = new Array(sectionCount);
  for (let si = sectionCount - 1; si >= 0; si--) {
    let p1: Complex;
    [p1, p] = take(p, worstIndex(p));
    const realPolesLeft = p.filter(isReal).length;
    if (isReal(p1) && realPolesLeft === 0) {
      // The last real pole: a first-order section.
      let z1: Complex;
      [z1, z] = take(z, nearestIndex(z, p1, 'real'));
      sos[si] = section([z1, cx(0)], [p1, cx(0)]);
    } else if (p.length + 1 === z.length && !isReal(p1) && realPolesLeft === 1 && z.filter(isReal).length === 1) {
      // One real pole and one real zero remain for later: this complex pole must take complex zeros.
      let z1: Complex;
      [z1, z] = take(z, nearestIndex(z, p1, 'complex'));
      sos[si] = section([z1, cx(z1.re, -z1.im)], [p1, cx(p1.re, -p1.im)]);
    } else {
      let p2: Complex;
      if (isReal(p1)) {
        const realIndices = p.map((v, i) => (isReal(v) ? i : -1)).filter((i) => i >= 0);
        const w = worstIndex(realIndices.map((i) => p[i]));
        [p2, p] = take(p, realIndices[w]);
      } else {
        p2 = cx(p1.re, -p1.im);
      }
      if (z.length > 0) {
        let z1: Complex;
        [z1, z] = take(z, nearestIndex(z, p1, 'any'));
        if (!isReal(z1)) {
          sos[si] = section([z1, cx(z1.re, -z1.im)], [p1, p2]);
        } else if (z.length > 0) {
          let z2: Complex;
          [z2, z] = take(z, nearestIndex(z, p1, 'real'));
          sos[si] = section([z1, z2], [p1, p2]);
        } else {
          sos[si] = section([z1], [p1, p2]);
        }
      } else {
        sos[si] = section([], [p1, p2]);
      }
    }
  }
  for (let i = 0; i < 3; i++) sos[0][i] *= design.gain;
  return sos;
}
