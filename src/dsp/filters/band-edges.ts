/** Shape of a frequency-selective filter and checks of its band edges. */

export const FILTER_RESPONSES = ['lowpass', 'highpass', 'bandpass', 'bandstop'] as const;

export type FilterResponse = (typeof FILTER_RESPONSES)[number];

/** Band edges in Hz: `cutoff` for low/high-pass, `low` and `high` for band-pass/band-stop. */
export interface BandEdges {
  cutoff?: number;
  low?: number;
  high?: number;
}

/**
 * The edges a response needs, in Hz, checked against 0 < f < fs/2 and low < high.
 * Throws RangeError naming the field when one is missing or out of range.
 */
export function checkedEdges(response: FilterResponse, edges: BandEdges, sampleRate: number): number[] {
  if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) {
    throw new RangeError(`sampleRate: must be a finite number > 0 Hz, got ${sampleRate}`);
  }
  const nyquist = sampleRate / 2;
  const need = (field: 'cutoff' | 'low' | 'high'): number => {
    const f = edges[field];
    if (f === undefined || !Number.isFinite(f)) throw new RangeError(`${field}: required for a ${response} filter (Hz)`);
    if (f <= 0) throw new RangeError(`${field}: must be > 0 Hz, got ${f}`);
    if (f >= nyquist) throw new RangeError(`${field}: ${f} Hz must lie below the Nyquist frequency ${nyquist} Hz`);
    return f;
  };
  if (response === 'lowpass' || response === 'highpass') return [need('cutoff')];
  const low = need('low');
  const high = need('high');
  if (!(low < high)) throw new RangeError(`low: ${low} Hz must lie below high (${high} Hz)`);
  return [low, high];
}

/** Which edge field of a response lies at or above Nyquist, if any (for chain warnings). */
export function edgeAboveNyquist(
  response: FilterResponse,
  edges: BandEdges,
  sampleRate: number,
): { field: 'cutoff' | 'low' | 'high'; value: number } | undefined {
  const fields: ('cutoff' | 'low' | 'high')[] =
    response === 'lowpass' || response === 'highpass' ? ['cutoff'] : ['low', 'high'];
  for (const field of fields) {
    const v = edges[field];
    if (v !== undefined && v >= sampleRate / 2) return { field, value: v };
  }
  return undefined;
}
