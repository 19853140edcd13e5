/**
 * Minimal complex arithmetic for filter design (poles, zeros, responses). Design runs once per
 * chain, so clarity wins over speed here; the streaming loops never use these objects.
 */
export interface Complex {
  re: number;
  im: number;
}

/** A complex number from its parts. */
export const cx = (re: number, im = 0): Complex => ({ re, im });

/** a + b */
export const cadd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });

/** a - b */
export const csub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });

/** a * b */
export const cmul = (a: Complex, b: Complex): Complex => ({
  re: a.re * b.re - a.im * b.im,
  im: a.re * b.im + a.im * b.re,
});

/** a / b (Smith's method, which avoids overflow when |b| is large or small). */
export function cdiv(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

/** Scale by a real number. */
export const cscale = (a: Complex, s: number): Complex => ({ re: a.re * s, im: a.im * s });

/** Complex conjugate. */
export const cconj = (a: Complex): Complex => ({ re: a.re, im: -a.im });

/** Modulus |a|. */
export const cabs = (a: Complex): number => Math.hypot(a.re, a.im);

/** Principal square root. */
export function csqrt(a: Complex): Complex {
  const m = cabs(a);
  if (m === 0) return { re: 0, im: 0 };
  const re = Math.sqrt((m + a.re) / 2);
  const im = Math.sqrt((m - a.re) / 2);
  return { re, im: a.im < 0 ? -im : im };
}

/** e^{j theta} */
export const cexpj = (theta: number): Complex => ({ re: Math.cos(theta), im: Math.sin(theta) });

/** Product of all entries (1 for an empty list). */
export function cprod(values: Complex[]): Complex {
  let p: Complex = { re: 1, im: 0 };
  for (const v of values) p = cmul(p, v);
  return p;
}
