import { checkedEdges, type BandEdges, type FilterResponse } from './band-edges';
import { designWindow, type DesignWindow } from './design-windows';

/** Longest FIR the designers produce: beyond this a design is almost certainly a unit mistake. */
export const MAX_FIR_TAPS = 65535;

export interface WindowedSincSpec extends BandEdges {
  response: FilterResponse;
  /** Number of taps (filter length). */
  taps: number;
  window: DesignWindow;
  /** Kaiser shape parameter, used when `window` is 'kaiser'. */
  beta?: number;
  /** Hz. */
  sampleRate: number;
}

const sinc = (x: number): number => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

/**
 * Linear-phase FIR taps by the window method. Edges (Hz) sit at the -6 dB point; the taps are
 * scaled for unit gain at the centre of the first pass band (DC, Nyquist, or the band centre),
 * the same convention as scipy.signal.firwin with scale=True.
 */
export function windowedSincTaps(spec: WindowedSincSpec): Float64Array {
  const { response, taps, sampleRate } = spec;
  if (!Number.isInteger(taps) || taps < 1 || taps > MAX_FIR_TAPS) {
    throw new RangeError(`taps: must be an integer from 1 to ${MAX_FIR_TAPS}, got ${taps}`);
  }
  if ((response === 'highpass' || response === 'bandstop') && taps % 2 === 0) {
    // An even-length symmetric filter has a zero at Nyquist, so it cannot pass there.
    throw new RangeError(`taps: must be odd for a ${response} filter, got ${taps}`);
  }
  const nyquist = sampleRate / 2;
  const edges = checkedEdges(response, spec, sampleRate).map((f) => f / nyquist);
  // Pass bands as [left, right] pairs in units of Nyquist.
  let bands: [number, number][];
  if (response === 'lowpass') bands = [[0, edges[0]]];
  else if (response === 'highpass') bands = [[edges[0], 1]];
  else if (response === 'bandpass') bands = [[edges[0], edges[1]]];
  else bands = [[0, edges[0]], [edges[1], 1]];

  const alpha = (taps - 1) / 2;
  const h = new Float64Array(taps);
  for (let n = 0; n < taps; n++) {
    const m = n - alpha;
    let v = 0;
    for (const [left, right] of bands) v += right * sinc(right * m) - left * sinc(left * m);
    h[n] = v;
  }
  const w = designWindow(spec.window, taps, spec.beta ?? 0);
  for (let n = 0; n < taps; n++) h[n] *= w[n];

  const [left, right] = bands[0];
  const scaleFrequency = left === 0 ? 0 : right === 1 ? 1 : (left + right) / 2;
  let gain = 0;
  for (let n = 0; n < taps; n++) gain += h[n] * Math.cos(Math.PI * (n - alpha) * scaleFrequency);
  for (let n = 0; n < taps; n++) h[n] /= gain;
  return h;
}
