/**
 * Axis scaling with SI prefixes: a plot of 2.41 GHz +- 2 MHz reads best in MHz, a 65 ms trace in
 * ms. The data are divided by the prefix's power before plotting and the axis title carries the
 * prefixed unit, so ticks stay short numbers and hover texts show the unit.
 */

const PREFIXES: Record<number, string> = { [-4]: 'p', [-3]: 'n', [-2]: 'µ', [-1]: 'm', 0: '', 1: 'k', 2: 'M', 3: 'G', 4: 'T' };

/** A unit scale for one axis. */
export interface AxisScale {
  /** Divide values in the base unit by this before plotting. */
  divisor: number;
  /** The prefixed unit shown on the axis, e.g. "MHz". */
  unit: string;
}

/**
 * The prefix that makes the tick spacing of an axis spanning `low`..`high` (base unit) read as
 * plain numbers: chosen from the span, not the magnitude, so an RF axis 2410..2414 MHz keeps
 * its MHz rather than showing 2.41 GHz on every tick.
 */
export function axisScale(low: number, high: number, unit: string): AxisScale {
  const span = Math.abs(high - low) || Math.abs(high) || 1;
  const power = Math.max(-4, Math.min(4, Math.floor(Math.log10(span) / 3)));
  return { divisor: 1000 ** power, unit: PREFIXES[power] + unit };
}

/** Axis title "Frequency (MHz)". */
export function axisTitle(label: string, scale: AxisScale): string {
  return scale.unit ? `${label} (${scale.unit})` : label;
}

/** Values divided by the scale's divisor, as a plain array for Plotly. */
export function scaled(values: ArrayLike<number>, scale: AxisScale, offset = 0): number[] {
  const out = new Array<number>(values.length);
  for (let k = 0; k < values.length; k++) out[k] = (values[k] + offset) / scale.divisor;
  return out;
}
