import { csqrt, cx, type Complex } from './complex';
import type { SosMatrix } from './zpk-to-sos';

/** Poles of every section (roots of a0 z^2 + a1 z + a2). */
export function sosPoles(sos: SosMatrix): Complex[] {
  const poles: Complex[] = [];
  for (const [, , , a0, a1, a2] of sos) {
    if (a0 === 0) throw new RangeError('sos: a0 must not be 0');
    const p = a1 / a0;
    const q = a2 / a0;
    if (q === 0) {
      // First-order (or pure delay) section: one pole at -p, the other at the origin.
      poles.push(cx(-p), cx(0));
      continue;
    }
    const d = csqrt(cx(p * p - 4 * q));
    poles.push(cx((-p + d.re) / 2, d.im / 2), cx((-p - d.re) / 2, -d.im / 2));
  }
  return poles;
}

/** Largest pole modulus of a cascade; the cascade is stable when it is below 1. */
export function sosPoleRadius(sos: SosMatrix): number {
  return sosPoles(sos).reduce((m, p) => Math.max(m, Math.hypot(p.re, p.im)), 0);
}

/** True when every pole lies strictly inside the unit circle. */
export function isSosStable(sos: SosMatrix): boolean {
  return sosPoleRadius(sos) < 1;
}
