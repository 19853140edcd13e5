/**
 * Spectrum markers of the run page: two markers (A and B) that sit on bins of the full-resolution
 * spectrum, their readings and their difference, and the noise floor as the median level.
 * Pure functions over plain arrays; frequencies in Hz from the probed stream's 0 Hz, levels in the
 * spectrum's unit (dBFS/Hz, dBFS, dBm...).
 */

export type MarkerName = 'A' | 'B';

/** A marker on one bin of the spectrum. */
export interface Marker {
  /** Bin index in the full spectrum. */
  index: number;
  /** Hz. */
  frequency: number;
  /** Level in the spectrum's unit; null where the engine had no finite level. */
  level: number | null;
}

/** The spectrum a marker reads: ascending frequencies (Hz) and their levels. */
export interface MarkerSpectrum {
  frequencies: number[];
  levels: (number | null)[];
}

/** Index of the bin whose frequency is nearest `frequency` (Hz); frequencies ascend. */
export function nearestBin(frequencies: number[], frequency: number): number {
  const n = frequencies.length;
  if (n === 0) throw new RangeError('nearestBin: the spectrum has no bins');
  let low = 0;
  let high = n - 1;
  while (high - low > 1) {
    const mid = (low + high) >> 1;
    if (frequencies[mid]! <= frequency) low = mid;
    else high = mid;
  }
  return Math.abs(frequencies[high]! - frequency) < Math.abs(frequencies[low]! - frequency) ? high : low;
}

/** The marker on bin `index`, clamped to the spectrum. */
export function markerAtBin(spectrum: MarkerSpectrum, index: number): Marker {
  const i = Math.max(0, Math.min(spectrum.frequencies.length - 1, Math.round(index)));
  return { index: i, frequency: spectrum.frequencies[i]!, level: spectrum.levels[i] ?? null };
}

/** The marker on the bin nearest `frequency` (Hz). */
export function markerAt(spectrum: MarkerSpectrum, frequency: number): Marker {
  return markerAtBin(spectrum, nearestBin(spectrum.frequencies, frequency));
}

/** Difference B - A: ΔF in Hz and ΔL in the spectrum's unit (dB for levels); null level when either is missing. */
export function markerDifference(a: Marker, b: Marker): { deltaFrequency: number; deltaLevel: number | null } {
  return { deltaFrequency: b.frequency - a.frequency, deltaLevel: a.level !== null && b.level !== null ? b.level - a.level : null };
}

/**
 * The noise floor as the median of the finite levels: a spectrum is mostly noise bins, so the
 * median ignores the few bins a signal occupies (common practice). Null when no level is finite.
 */
export function medianLevel(levels: (number | null)[]): number | null {
  const finite = levels.filter((level): level is number => level !== null && Number.isFinite(level)).sort((x, y) => x - y);
  if (finite.length === 0) return null;
  const middle = finite.length >> 1;
  return finite.length % 2 === 1 ? finite[middle]! : (finite[middle - 1]! + finite[middle]!) / 2;
}

/** The highest bin of the spectrum between two frequencies (Hz, inclusive), for "marker to peak". */
export function peakBin(spectrum: MarkerSpectrum, low = -Infinity, high = Infinity): number | null {
  let best: number | null = null;
  for (let i = 0; i < spectrum.frequencies.length; i++) {
    const f = spectrum.frequencies[i]!;
    const level = spectrum.levels[i];
    if (f < low || f > high || level === null || level === undefined || !Number.isFinite(level)) continue;
    if (best === null || level > spectrum.levels[best]!) best = i;
  }
  return best;
}
