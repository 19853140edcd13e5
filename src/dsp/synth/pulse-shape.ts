/**
 * Root-raised-cosine pulse for shaping digital carriers, as a closed form and as a table for fast
 * evaluation at any time offset (the sample rate need not be a multiple of the symbol rate).
 *
 * Closed form with time in symbol periods (t = time * symbolRate) and roll-off b, for a pulse of
 * unit energy when untruncated (integral of p^2 over t equals 1):
 *   p(0)          = 1 - b + 4 b / pi
 *   p(+-1/(4 b))  = (b / sqrt 2) [(1 + 2/pi) sin(pi / (4 b)) + (1 - 2/pi) cos(pi / (4 b))]
 *   p(t)          = [sin(pi t (1 - b)) + 4 b t cos(pi t (1 + b))] / [pi t (1 - (4 b t)^2)]
 * Its spectrum is the square root of the raised-cosine spectrum, so a matched filter with the same
 * pulse gives a raised-cosine overall response, which has no intersymbol interference at the symbol
 * instants (Nyquist's criterion).
 */

/** Root-raised-cosine value at `t` symbol periods from the pulse centre, roll-off `rollOff` in (0, 1]. */
export function rootRaisedCosine(t: number, rollOff: number): number {
  const b = rollOff;
  if (t === 0) return 1 - b + (4 * b) / Math.PI;
  const singular = 1 / (4 * b);
  // Near +-1/(4b) both numerator and denominator vanish; use the limit there.
  if (Math.abs(Math.abs(t) - singular) < 1e-9) {
    const a = Math.PI / (4 * b);
    return (b / Math.SQRT2) * ((1 + 2 / Math.PI) * Math.sin(a) + (1 - 2 / Math.PI) * Math.cos(a));
  }
  const x = 4 * b * t;
  return (Math.sin(Math.PI * t * (1 - b)) + x * Math.cos(Math.PI * t * (1 + b))) / (Math.PI * t * (1 - x * x));
}

/** Table points per symbol period: linear interpolation error then stays near 1e-5 of the peak. */
const POINTS_PER_SYMBOL = 256;

/**
 * A truncated root-raised-cosine pulse (span symbols long, centred on 0) tabulated for linear
 * interpolation, scaled so that a stream of unit-power random symbols has unit mean power.
 */
export class PulseTable {
  /** Half the span in symbol periods: the pulse is zero for |t| >= halfSpan. */
  readonly halfSpan: number;
  /** Table points per symbol period. */
  readonly pointsPerSymbol = POINTS_PER_SYMBOL;
  /**
   * Pulse values at t = k / pointsPerSymbol - halfSpan, k = 0..span * pointsPerSymbol, plus a
   * trailing zero so interpolation at the last point needs no bounds test. Read-only.
   */
  readonly values: Float64Array;

  constructor(rollOff: number, spanSymbols: number) {
    if (!(rollOff > 0 && rollOff <= 1)) throw new RangeError(`rollOff: must be in (0, 1], got ${rollOff}`);
    if (!Number.isInteger(spanSymbols) || spanSymbols < 2) throw new RangeError(`span: must be an integer >= 2 symbols, got ${spanSymbols}`);
    this.halfSpan = spanSymbols / 2;
    const points = spanSymbols * POINTS_PER_SYMBOL + 1;
    // One extra zero so interpolation at the last point needs no bounds test.
    const values = new Float64Array(points + 1);
    let energy = 0;
    for (let k = 0; k < points; k++) {
      const v = rootRaisedCosine(k / POINTS_PER_SYMBOL - this.halfSpan, rollOff);
      values[k] = v;
      // Trapezoid rule over the truncated pulse.
      energy += (k === 0 || k === points - 1 ? 0.5 : 1) * v * v;
    }
    energy /= POINTS_PER_SYMBOL;
    // Truncation loses a little energy; restoring it keeps the carrier at its requested level.
    const gain = 1 / Math.sqrt(energy);
    for (let k = 0; k < points; k++) values[k] *= gain;
    this.values = values;
  }

  /** Pulse value at `t` symbol periods from the centre (|t| < halfSpan), linearly interpolated. */
  valueAt(t: number): number {
    const position = (t + this.halfSpan) * POINTS_PER_SYMBOL;
    if (position < 0) return 0;
    const index = Math.floor(position);
    if (index >= this.values.length - 1) return 0;
    const frac = position - index;
    const v0 = this.values[index];
    return v0 + frac * (this.values[index + 1] - v0);
  }
}
