/**
 * Sine-wave fit of a single tone (IEEE Std 1241-2010, "IEEE Standard for Terminology and Test
 * Methods for Analog-to-Digital Converters", section 4.1.4: three- and four-parameter least-squares
 * fits). The four-parameter fit (amplitude in two quadratures, offset, frequency) leaves a residual
 * that is everything but the tone: noise and distortion, whatever window a spectrum would use. A
 * second, linear fit at the found frequency adds harmonics 2..H (their aliased positions come for
 * free: a sampled cos(h w n) is the alias), so noise and distortion can be told apart.
 *
 * Complex streams fit A e^{jwn} + C instead (one rotating phasor and a complex offset).
 */

export interface SineFitOptions {
  /** Tone frequency estimate in cycles per sample (signed for complex), e.g. from a spectrum. */
  cyclesPerSample: number;
  complex: boolean;
  /** Half-width (cycles/sample) of the search around the estimate before the iterative fit. */
  searchHalfWidth: number;
  /** Highest harmonic fitted for real streams (1 = none). */
  harmonics: number;
}

export interface HarmonicFit {
  /** Harmonic number (2..H). */
  order: number;
  /** Where it lands after aliasing, cycles per sample in 0..0.5. */
  aliasedCyclesPerSample: number;
  /** Power (linear, full scale 1.0), or null when it lands on DC, the fundamental or a lower harmonic. */
  power: number | null;
  /** Why `power` is null. */
  reason?: string;
}

export interface SineFit {
  /** Fitted frequency (cycles per sample; signed for complex). */
  cyclesPerSample: number;
  /** Tone power (linear): A^2/2 for a real sine, |A|^2 for a complex phasor. */
  tonePower: number;
  /** Mean square of the residual after the tone and offset are fitted: noise and distortion. */
  noiseAndDistortionPower: number;
  /** Mean square of the residual after the harmonics are fitted too (real); = the above for complex. */
  noisePower: number;
  /** Harmonics 2..H (real streams only). */
  harmonics: HarmonicFit[];
  /** Samples used. */
  samples: number;
}

/** Solves the symmetric system G x = b (p x p, row-major) by Gaussian elimination with pivoting. */
function solve(g: Float64Array, b: Float64Array, p: number): Float64Array | null {
  const a = Float64Array.from(g);
  const x = Float64Array.from(b);
  for (let c = 0; c < p; c++) {
    let pivot = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r * p + c]) > Math.abs(a[pivot * p + c])) pivot = r;
    if (!(Math.abs(a[pivot * p + c]) > 1e-12 * Math.abs(a[c * p + c] || 1))) return null;
    if (pivot !== c) {
      for (let k = 0; k < p; k++) [a[c * p + k], a[pivot * p + k]] = [a[pivot * p + k], a[c * p + k]];
      [x[c], x[pivot]] = [x[pivot], x[c]];
    }
    for (let r = c + 1; r < p; r++) {
      const f = a[r * p + c] / a[c * p + c];
      if (f === 0) continue;
      for (let k = c; k < p; k++) a[r * p + k] -= f * a[c * p + k];
      x[r] -= f * x[c];
    }
  }
  for (let c = p - 1; c >= 0; c--) {
    let s = x[c];
    for (let k = c + 1; k < p; k++) s -= a[c * p + k] * x[k];
    x[c] = s / a[c * p + c];
  }
  return x;
}

/**
 * Linear least squares over rows produced by `row(n, r, basis)` (fills `basis`, returns the
 * observed value); returns the coefficients and the residual mean square, computed in a second
 * pass so a residual 1e-10 of the signal power is not lost to cancellation.
 */
function leastSquares(
  rows: number,
  p: number,
  row: (index: number, basis: Float64Array) => number,
  withResidual = true,
): { coef: Float64Array; residual: number } | null {
  const g = new Float64Array(p * p);
  const b = new Float64Array(p);
  const basis = new Float64Array(p);
  for (let i = 0; i < rows; i++) {
    const y = row(i, basis);
    for (let r = 0; r < p; r++) {
      const br = basis[r];
      b[r] += br * y;
      for (let c = r; c < p; c++) g[r * p + c] += br * basis[c];
    }
  }
  for (let r = 0; r < p; r++) for (let c = 0; c < r; c++) g[r * p + c] = g[c * p + r];
  const coef = solve(g, b, p);
  if (!coef) return null;
  let residual = 0;
  if (!withResidual) return { coef, residual: NaN };
  for (let i = 0; i < rows; i++) {
    let e = row(i, basis);
    for (let r = 0; r < p; r++) e -= coef[r] * basis[r];
    residual += e * e;
  }
  return { coef, residual };
}

/** |sum x w e^{-j2pi f k}|^2 with a Hann taper `w`: a peak search that side lobes do not mislead. */
function taperedPower(x: Float32Array, complex: boolean, taper: Float64Array, f: number): number {
  const n = taper.length;
  // A rotating phasor instead of cos/sin per sample; its rounding drift stays near 1e-16 n.
  const dc = Math.cos(-2 * Math.PI * f);
  const ds = Math.sin(-2 * Math.PI * f);
  let c = 1;
  let s = 0;
  let re = 0;
  let im = 0;
  for (let k = 0; k < n; k++) {
    const w = taper[k];
    const xi = complex ? x[2 * k] : x[k];
    const xq = complex ? x[2 * k + 1] : 0;
    re += w * (xi * c - xq * s);
    im += w * (xi * s + xq * c);
    const c2 = c * dc - s * ds;
    s = c * ds + s * dc;
    c = c2;
  }
  return re * re + im * im;
}

/** Frequency (cycles/sample) of the largest tapered-DFT peak within `halfWidth` of `f0`. */
function coarseFrequency(x: Float32Array, complex: boolean, f0: number, halfWidth: number): number {
  const n = complex ? x.length / 2 : x.length;
  const taper = new Float64Array(n).map((_, k) => 0.5 - 0.5 * Math.cos((2 * Math.PI * (k + 0.5)) / n));
  const step = 0.5 / n;
  const points = Math.min(256, Math.max(1, Math.ceil(halfWidth / step)));
  let best = f0;
  let bestPower = taperedPower(x, complex, taper, f0);
  for (let i = -points; i <= points; i++) {
    if (i === 0) continue;
    const f = f0 + (i * halfWidth) / points;
    const p = taperedPower(x, complex, taper, f);
    if (p > bestPower) [best, bestPower] = [f, p];
  }
  // Golden-section search inside the main lobe, where the tapered power is unimodal.
  let lo = best - Math.max(step, halfWidth / points);
  let hi = best + Math.max(step, halfWidth / points);
  const r = (Math.sqrt(5) - 1) / 2;
  for (let i = 0; i < 40; i++) {
    const a = hi - r * (hi - lo);
    const b = lo + r * (hi - lo);
    if (taperedPower(x, complex, taper, a) > taperedPower(x, complex, taper, b)) hi = b;
    else lo = a;
  }
  return 0.5 * (lo + hi);
}

/** Three-parameter fit at a known frequency f (Std 1241 4.1.4.2): tone quadratures and offset. */
function threeParameter(x: Float32Array, complex: boolean, f: number, withResidual: boolean): { coef: Float64Array; residual: number } | null {
  const n = complex ? x.length / 2 : x.length;
  const mid = (n - 1) / 2;
  const w = 2 * Math.PI * f;
  if (complex) {
    // A e^{jwt} + C, unknowns Ar, Ai, Cr, Ci; row i even is I, odd is Q.
    return leastSquares(
      2 * n,
      4,
      (i, basis) => {
        const t = (i >> 1) - mid;
        const c = Math.cos(w * t);
        const s = Math.sin(w * t);
        const even = (i & 1) === 0;
        basis[0] = even ? c : s;
        basis[1] = even ? -s : c;
        basis[2] = even ? 1 : 0;
        basis[3] = even ? 0 : 1;
        return x[i];
      },
      withResidual,
    );
  }
  return leastSquares(
    n,
    3,
    (k, basis) => {
      const t = k - mid;
      basis[0] = Math.cos(w * t);
      basis[1] = Math.sin(w * t);
      basis[2] = 1;
      return x[k];
    },
    withResidual,
  );
}

/** Four-parameter fit (Std 1241 4.1.4.3): Gauss-Newton on frequency from a close start. */
function fourParameter(x: Float32Array, complex: boolean, start: number): { f: number; coef: Float64Array; residual: number } | null {
  const n = complex ? x.length / 2 : x.length;
  const mid = (n - 1) / 2;
  let f = start;
  for (let iter = 0; iter < 12; iter++) {
    // The three-parameter fit at f gives the amplitudes the frequency derivative needs.
    const three = threeParameter(x, complex, f, false);
    if (!three) break;
    const [a, b] = [three.coef[0], three.coef[1]];
    const w = 2 * Math.PI * f;
    // Linearised update: d/dw of the tone times dw, with t scaled by 1/n for conditioning.
    const four = complex
      ? leastSquares(
          2 * n,
          5,
          (i, basis) => {
            const t = (i >> 1) - mid;
            const c = Math.cos(w * t);
            const s = Math.sin(w * t);
            const u = t / n;
            const even = (i & 1) === 0;
            basis[0] = even ? c : s;
            basis[1] = even ? -s : c;
            basis[2] = even ? 1 : 0;
            basis[3] = even ? 0 : 1;
            basis[4] = even ? -u * (a * s + b * c) : u * (a * c - b * s);
            return x[i];
          },
          false,
        )
      : leastSquares(
          n,
          4,
          (k, basis) => {
            const t = k - mid;
            const c = Math.cos(w * t);
            const s = Math.sin(w * t);
            basis[0] = c;
            basis[1] = s;
            basis[2] = 1;
            basis[3] = (t / n) * (-a * s + b * c);
            return x[k];
          },
          false,
        );
    if (!four) break;
    const df = four.coef[complex ? 4 : 3] / n / (2 * Math.PI);
    if (!Number.isFinite(df)) break;
    f += Math.max(-0.5 / n, Math.min(0.5 / n, df));
    // 1e-6 cycles over the record leaves a phase error whose power is ~1e-11 of the tone's.
    if (Math.abs(df) < 1e-6 / n) break;
  }
  const final = threeParameter(x, complex, f, true);
  return final ? { f, coef: final.coef, residual: final.residual / n } : null;
}

/**
 * Sine fit of the tone near `cyclesPerSample` in `x` (real values, or interleaved I/Q): tone
 * power, residual noise-and-distortion power and, for real streams, harmonics 2..H. Null when the
 * fit is singular (too few samples, no signal).
 */
export function fitSine(x: Float32Array, options: SineFitOptions): SineFit | null {
  const { complex } = options;
  const n = complex ? x.length / 2 : x.length;
  if (n < 8) return null;
  const start = coarseFrequency(x, complex, options.cyclesPerSample, options.searchHalfWidth);
  const fit = fourParameter(x, complex, start);
  if (!fit) return null;
  const { f, coef } = fit;
  const tonePower = complex ? coef[0] * coef[0] + coef[1] * coef[1] : (coef[0] * coef[0] + coef[1] * coef[1]) / 2;
  const harmonics: HarmonicFit[] = [];
  let noisePower = fit.residual;
  if (!complex && options.harmonics >= 2) {
    const folded = (h: number) => {
      const a = (((h * f) % 1) + 1) % 1;
      return a > 0.5 ? 1 - a : a;
    };
    // A harmonic within a bin (1/n) of DC, the fundamental or a lower harmonic cannot be told apart from it.
    const used: number[] = [Math.abs(folded(1))];
    const orders: { order: number; alias: number; nyquist: boolean }[] = [];
    for (let h = 2; h <= options.harmonics; h++) {
      const alias = folded(h);
      let reason: string | undefined;
      if (alias * n < 1) reason = `falls on 0 Hz after aliasing, where it cannot be told from the DC offset`;
      else {
        const clash = used.findIndex((u) => Math.abs(u - alias) * n < 1);
        if (clash >= 0) reason = clash === 0 ? 'falls on the fundamental after aliasing' : `falls on a lower harmonic after aliasing`;
      }
      harmonics.push({ order: h, aliasedCyclesPerSample: alias, power: null, reason });
      if (reason) continue;
      used.push(alias);
      orders.push({ order: h, alias, nyquist: (0.5 - alias) * n < 0.5 });
    }
    const mid = (n - 1) / 2;
    const w = 2 * Math.PI * f;
    const columns = 3 + orders.reduce((s, o) => s + (o.nyquist ? 1 : 2), 0);
    const full = leastSquares(n, columns, (k, basis) => {
      const t = k - mid;
      basis[0] = Math.cos(w * t);
      basis[1] = Math.sin(w * t);
      basis[2] = 1;
      let c = 3;
      for (const o of orders) {
        if (o.nyquist) {
          // At fs/2 only (-1)^k exists; the centred-time cosine could be near zero there.
          basis[c++] = k % 2 === 0 ? 1 : -1;
          continue;
        }
        basis[c++] = Math.cos(o.order * w * t);
        basis[c++] = Math.sin(o.order * w * t);
      }
      return x[k];
    });
    if (full) {
      noisePower = full.residual / n;
      let c = 3;
      for (const o of orders) {
        const a = full.coef[c++];
        const b = o.nyquist ? 0 : full.coef[c++];
        const entry = harmonics.find((h) => h.order === o.order)!;
        // A harmonic at fs/2 has no quadrature part: its power is a^2 (a cos(pi n) at full swing), not a^2/2.
        entry.power = o.nyquist ? a * a : (a * a + b * b) / 2;
      }
    }
  }
  return { cyclesPerSample: f, tonePower, noiseAndDistortionPower: fit.residual, noisePower, harmonics, samples: n };
}
