/**
 * Figures of merit of a window (F. J. Harris, Proc. IEEE 66(1), 1978, section IV): what a window
 * does to a tone's level and to noise, so readouts can correct for it.
 */
import { getFftPlan } from '../fft/plan';

function checkWindow(w: ArrayLike<number>): void {
  if (w.length < 1) throw new RangeError('window: needs at least one coefficient');
}

/** Coherent gain: sum(w)/N, the amplitude factor a window applies to a bin-centred tone. */
export function coherentGain(w: ArrayLike<number>): number {
  checkWindow(w);
  let s = 0;
  for (let n = 0; n < w.length; n++) s += w[n];
  return s / w.length;
}

/** Equivalent noise bandwidth in bins: N sum(w^2) / (sum w)^2. */
export function enbwBins(w: ArrayLike<number>): number {
  checkWindow(w);
  let s = 0;
  let s2 = 0;
  for (let n = 0; n < w.length; n++) {
    s += w[n];
    s2 += w[n] * w[n];
  }
  return (w.length * s2) / (s * s);
}

/** Scalloping loss in dB (positive): level drop of a tone half-way between two bins. */
export function scallopingLossDb(w: ArrayLike<number>): number {
  checkWindow(w);
  const n = w.length;
  let re = 0;
  let im = 0;
  let s = 0;
  for (let k = 0; k < n; k++) {
    const phase = (Math.PI * k) / n;
    re += w[k] * Math.cos(phase);
    im -= w[k] * Math.sin(phase);
    s += w[k];
  }
  return -20 * Math.log10(Math.hypot(re, im) / s);
}

/**
 * Highest side lobe in dB relative to the main lobe peak (negative), from a zero-padded DFT
 * `oversample` times the window length. The main lobe ends at the first local minimum below
 * -6 dB, so a flat top's ripple near the centre is not taken for a null.
 */
export function highestSideLobeDb(w: ArrayLike<number>, oversample = 64): number {
  checkWindow(w);
  let size = 1;
  while (size < w.length * oversample) size *= 2;
  const data = new Float64Array(size);
  for (let k = 0; k < w.length; k++) data[k] = w[k];
  const out = new Float64Array(2 * size);
  getFftPlan(size).forwardReal(data, out);
  const half = size / 2;
  const mag = new Float64Array(half + 1);
  for (let k = 0; k <= half; k++) mag[k] = Math.hypot(out[2 * k], out[2 * k + 1]);
  let k = 1;
  while (k < half && (mag[k] > 0.5 * mag[0] || mag[k + 1] < mag[k])) k++;
  let highest = 0;
  for (; k <= half; k++) highest = Math.max(highest, mag[k]);
  return 20 * Math.log10(highest / mag[0]);
}

/** Half-width of the main lobe in bins (first null from the centre) for a window name; used to mask a tone. */
export function mainLobeHalfWidthBins(name: string, beta = 8.6): number {
  switch (name) {
    case 'rectangular':
      return 1;
    case 'hann':
    case 'hamming':
      return 2;
    case 'blackman':
      return 3;
    case 'blackman-harris':
      return 4;
    case 'flattop':
      return 5;
    case 'kaiser':
      // Kaiser's main lobe null lies at sqrt(1 + (beta/pi)^2) bins.
      return Math.ceil(Math.sqrt(1 + (beta / Math.PI) ** 2));
    default:
      throw new RangeError(`window: unknown window "${name}"`);
  }
}
