import type { SosMatrix } from './zpk-to-sos';

/** A designed filter: FIR taps or IIR second-order sections. */
export type FilterDesign = { kind: 'fir'; taps: Float64Array } | { kind: 'iir'; sos: SosMatrix };

/** Magnitude, phase and group delay of a filter on a frequency grid. */
export interface FrequencyResponse {
  /** Hz. */
  frequencies: number[];
  /** dB re unit gain, floored at MAGNITUDE_FLOOR_DB where the response is an exact zero. */
  magnitudeDb: number[];
  /** rad, unwrapped along the grid. */
  phase: number[];
  /** samples; NaN where the response is zero and the delay is undefined. */
  groupDelay: number[];
  /** s (groupDelay / sample rate). */
  groupDelaySeconds: number[];
}

/** Lowest level reported, dB: an exact zero has no finite logarithm. */
export const MAGNITUDE_FLOOR_DB = -400;

/** `points` frequencies (Hz) from 0 to the Nyquist frequency inclusive. */
export function responseGrid(sampleRate: number, points: number): number[] {
  if (!Number.isInteger(points) || points < 2) throw new RangeError(`points: must be an integer >= 2, got ${points}`);
  return Array.from({ length: points }, (_, i) => (i * sampleRate) / 2 / (points - 1));
}

// Sum of c[k] e^{-j w k} and sum of k c[k] e^{-j w k}: the value of a polynomial in z^-1 on the
// unit circle and the numerator of its group delay.
function evaluate(c: ArrayLike<number>, w: number): [number, number, number, number] {
  let re = 0;
  let im = 0;
  let dre = 0;
  let dim = 0;
  for (let k = 0; k < c.length; k++) {
    const v = c[k];
    if (v === 0) continue;
    const cr = Math.cos(w * k) * v;
    const ci = -Math.sin(w * k) * v;
    re += cr;
    im += ci;
    dre += k * cr;
    dim += k * ci;
  }
  return [re, im, dre, dim];
}

// Group delay of one polynomial: Re( sum k c_k e^{-jwk} / sum c_k e^{-jwk} ).
function polynomialDelay(re: number, im: number, dre: number, dim: number): number {
  const m2 = re * re + im * im;
  return m2 === 0 ? NaN : (dre * re + dim * im) / m2;
}

// Steps of more than pi between neighbours are branch changes of atan2, not phase: take them out
// (the rule numpy.unwrap applies).
function unwrap(phase: number[]): number[] {
  const out = phase.slice();
  let correction = 0;
  for (let i = 1; i < phase.length; i++) {
    const step = phase[i] - phase[i - 1];
    if (Math.abs(step) >= Math.PI) {
      let wrapped = step - 2 * Math.PI * Math.floor((step + Math.PI) / (2 * Math.PI));
      if (wrapped === -Math.PI && step > 0) wrapped = Math.PI;
      correction += wrapped - step;
    }
    out[i] = phase[i] + correction;
  }
  return out;
}

/** Frequency response of a design at the given frequencies (Hz), for a sample rate (Hz). */
export function frequencyResponse(design: FilterDesign, sampleRate: number, frequencies: number[]): FrequencyResponse {
  if (!(sampleRate > 0)) throw new RangeError(`sampleRate: must be > 0 Hz, got ${sampleRate}`);
  const magnitudeDb: number[] = [];
  const rawPhase: number[] = [];
  const groupDelay: number[] = [];
  const sections: [ArrayLike<number>, ArrayLike<number>][] =
    design.kind === 'fir' ? [[design.taps, [1]]] : design.sos.map((row) => [row.slice(0, 3), row.slice(3, 6)]);
  for (const f of frequencies) {
    const w = (2 * Math.PI * f) / sampleRate;
    let hre = 1;
    let him = 0;
    let delay = 0;
    for (const [b, a] of sections) {
      const [br, bi, bdr, bdi] = evaluate(b, w);
      const [ar, ai, adr, adi] = evaluate(a, w);
      // H *= B / A
      const am = ar * ar + ai * ai;
      const qr = (br * ar + bi * ai) / am;
      const qi = (bi * ar - br * ai) / am;
      const nr = hre * qr - him * qi;
      him = hre * qi + him * qr;
      hre = nr;
      delay += polynomialDelay(br, bi, bdr, bdi) - polynomialDelay(ar, ai, adr, adi);
    }
    const magnitude = Math.hypot(hre, him);
    magnitudeDb.push(magnitude > 0 ? Math.max(MAGNITUDE_FLOOR_DB, 20 * Math.log10(magnitude)) : MAGNITUDE_FLOOR_DB);
    rawPhase.push(Math.atan2(him, hre));
    groupDelay.push(delay);
  }
  return {
    frequencies: [...frequencies],
    magnitudeDb,
    phase: unwrap(rawPhase),
    groupDelay,
    groupDelaySeconds: groupDelay.map((d) => d / sampleRate),
  };
}
