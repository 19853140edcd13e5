/**
 * Error vector magnitude of a root-raised-cosine PSK/QAM carrier at 0 Hz with a known symbol rate
 * (definition: 3GPP TS 36.104 / TS 38.104 EVM annexes): matched filter, symbol timing by largest
 * symbol energy, carrier frequency from the M-th power of the symbols, then a decision-directed fit
 * of phase, frequency and complex gain; EVM_rms = sqrt(sum |z/g - d|^2 / sum |d|^2).
 */
import { constellation, type DigitalModulation } from '../synth/constellation';
import { rootRaisedCosine } from '../synth/pulse-shape';
import { getFftPlan } from '../fft/plan';

export interface EvmOptions {
  /** Samples per second (Hz). */
  sampleRate: number;
  /** Symbols per second (Hz). */
  symbolRate: number;
  modulation: DigitalModulation;
  /** Root-raised-cosine roll-off of the matched filter, (0, 1]. */
  rollOff: number;
}

export interface EvmResult {
  /** RMS error vector over RMS reference vector (ratio; x 100 for %). */
  evmRms: number;
  /** Modulation error ratio: sum |d|^2 / sum |e|^2 (dB). */
  merDb: number;
  /** Symbols measured. */
  symbols: number;
  /** Carrier frequency offset found and removed (Hz). */
  frequencyOffsetHz: number;
}

/** Matched filter span, symbols. */
const SPAN = 12;

/** 4-point Lagrange interpolation of interleaved complex `y` at fractional index t. */
function interpolate(y: Float64Array, t: number): [number, number] {
  const i = Math.floor(t);
  const u = t - i;
  const w = [(-u * (u - 1) * (u - 2)) / 6, ((u + 1) * (u - 1) * (u - 2)) / 2, (-(u + 1) * u * (u - 2)) / 2, ((u + 1) * u * (u - 1)) / 6];
  let re = 0;
  let im = 0;
  for (let j = 0; j < 4; j++) {
    re += w[j] * y[2 * (i - 1 + j)];
    im += w[j] * y[2 * (i - 1 + j) + 1];
  }
  return [re, im];
}

/** EVM of interleaved I/Q samples holding one carrier at 0 Hz. */
export function measureEvm(iq: Float32Array, options: EvmOptions): EvmResult {
  const { sampleRate, symbolRate, rollOff } = options;
  const sps = sampleRate / symbolRate;
  if (!(sps >= 2)) throw new RangeError(`symbolRate: needs at least 2 samples per symbol, got ${sps.toPrecision(3)} (sample rate ${sampleRate} Hz)`);
  // The matched filter costs 12 x sps multiplications per sample: decimate first beyond 64.
  if (sps > 64) throw new RangeError(`symbolRate: ${sps.toPrecision(3)} samples per symbol; decimate to 64 or fewer before measuring EVM`);
  const n = iq.length / 2;
  const half = Math.ceil((SPAN / 2) * sps);
  const usable = Math.floor((n - 4 * half - 4) / sps);
  if (usable < 64) throw new RangeError(`samples: ${n} samples hold too few symbols for EVM (64 at least after the ${SPAN}-symbol matched filter settles)`);

  // Matched filter (the transmit pulse), unit energy so noise keeps its variance.
  const taps = new Float64Array(2 * half + 1);
  let energy = 0;
  for (let m = -half; m <= half; m++) energy += (taps[m + half] = rootRaisedCosine(m / sps, rollOff)) ** 2;
  for (let m = 0; m < taps.length; m++) taps[m] /= Math.sqrt(energy);
  const y = new Float64Array(2 * n);
  for (let k = half; k < n - half; k++) {
    let re = 0;
    let im = 0;
    for (let m = -half; m <= half; m++) {
      const h = taps[m + half];
      re += h * iq[2 * (k - m)];
      im += h * iq[2 * (k - m) + 1];
    }
    y[2 * k] = re;
    y[2 * k + 1] = im;
  }

  // Symbol timing: the phase (of 32 per symbol) with the largest symbol energy, refined by a parabola.
  const start = 2 * half + 2;
  const energyAt = (tau: number) => {
    let e = 0;
    for (let k = 0; k < usable; k++) {
      const [re, im] = interpolate(y, start + tau + k * sps);
      e += re * re + im * im;
    }
    return e;
  };
  const phases = 32;
  const energies = Array.from({ length: phases }, (_, p) => energyAt((p / phases) * sps));
  let best = 0;
  for (let p = 1; p < phases; p++) if (energies[p] > energies[best]) best = p;
  const [e0, e1, e2] = [energies[(best + phases - 1) % phases], energies[best], energies[(best + 1) % phases]];
  const denom = e0 - 2 * e1 + e2;
  const offset = denom < 0 ? (0.5 * (e0 - e2)) / denom : 0;
  const tau = (((best + offset) / phases) * sps + sps) % sps;
  const z = new Float64Array(2 * usable);
  for (let k = 0; k < usable; k++) [z[2 * k], z[2 * k + 1]] = interpolate(y, start + tau + k * sps);

  // Carrier frequency: the M-th power of the symbols is a line at M x the offset (cycles per symbol).
  const points = constellation(options.modulation).points;
  const power = options.modulation === 'bpsk' ? 2 : 4;
  let size = 1;
  while (size < 4 * usable) size *= 2;
  const raised = new Float64Array(2 * size);
  for (let k = 0; k < usable; k++) {
    let [re, im] = [1, 0];
    for (let p = 0; p < power; p++) [re, im] = [re * z[2 * k] - im * z[2 * k + 1], re * z[2 * k + 1] + im * z[2 * k]];
    raised[2 * k] = re;
    raised[2 * k + 1] = im;
  }
  const spectrum = getFftPlan(size).forward(raised, new Float64Array(2 * size));
  let peak = 0;
  const mag = (i: number) => Math.hypot(spectrum[2 * ((i + size) % size)], spectrum[2 * ((i + size) % size) + 1]);
  for (let i = 1; i < size; i++) if (mag(i) > mag(peak)) peak = i;
  const [m0, m1, m2] = [mag(peak - 1), mag(peak), mag(peak + 1)];
  const d = m0 - 2 * m1 + m2;
  const fine = d < 0 ? (0.5 * (m0 - m2)) / d : 0;
  let bin = peak + fine;
  if (bin > size / 2) bin -= size;
  let cyclesPerSymbol = bin / size / power;
  // The M-th power line's phase, less that of the constellation's own mean s^M (-1 for QPSK and
  // square QAM), gives the carrier phase up to the constellation's symmetry.
  let mr = 0;
  let mi = 0;
  for (let p = 0; p < points.length; p += 2) {
    let [re, im] = [1, 0];
    for (let q = 0; q < power; q++) [re, im] = [re * points[p] - im * points[p + 1], re * points[p + 1] + im * points[p]];
    mr += re;
    mi += im;
  }
  let phase = (Math.atan2(spectrum[2 * peak + 1], spectrum[2 * peak]) - Math.atan2(mi, mr)) / power;

  const rotated = new Float64Array(2 * usable);
  const derotate = () => {
    for (let k = 0; k < usable; k++) {
      const a = -(2 * Math.PI * cyclesPerSymbol * k + phase);
      const [c, s] = [Math.cos(a), Math.sin(a)];
      rotated[2 * k] = z[2 * k] * c - z[2 * k + 1] * s;
      rotated[2 * k + 1] = z[2 * k] * s + z[2 * k + 1] * c;
    }
  };
  const nearest = (re: number, im: number): number => {
    let bestPoint = 0;
    let bestDistance = Infinity;
    for (let p = 0; p < points.length; p += 2) {
      const dist = (re - points[p]) ** 2 + (im - points[p + 1]) ** 2;
      if (dist < bestDistance) [bestPoint, bestDistance] = [p, dist];
    }
    return bestPoint;
  };

  // Decision-directed refinement: complex gain, then phase and frequency from the residual angles.
  let gain = 1;
  let errorPower = 0;
  let referencePower = 0;
  for (let round = 0; round < 4; round++) {
    derotate();
    let rms = 0;
    for (let k = 0; k < 2 * usable; k++) rms += rotated[k] * rotated[k];
    if (round === 0) gain = Math.sqrt(rms / usable);
    // Least-squares complex gain g = sum z conj(d) / sum |d|^2, and a line through the angles of z/(g d).
    let gr = 0;
    let gi = 0;
    let dd = 0;
    const decided = new Int32Array(usable);
    for (let k = 0; k < usable; k++) {
      const p = (decided[k] = nearest(rotated[2 * k] / gain, rotated[2 * k + 1] / gain));
      const [pr, pi] = [points[p], points[p + 1]];
      gr += rotated[2 * k] * pr + rotated[2 * k + 1] * pi;
      gi += rotated[2 * k + 1] * pr - rotated[2 * k] * pi;
      dd += pr * pr + pi * pi;
    }
    gain = Math.hypot(gr, gi) / dd;
    phase += Math.atan2(gi, gr);
    derotate();
    let sk = 0;
    let skk = 0;
    let sa = 0;
    let ska = 0;
    errorPower = 0;
    referencePower = 0;
    for (let k = 0; k < usable; k++) {
      const p = decided[k];
      const [pr, pi] = [points[p], points[p + 1]];
      const [zr, zi] = [rotated[2 * k] / gain, rotated[2 * k + 1] / gain];
      errorPower += (zr - pr) ** 2 + (zi - pi) ** 2;
      referencePower += pr * pr + pi * pi;
      const angle = Math.atan2(zi * pr - zr * pi, zr * pr + zi * pi);
      sk += k;
      skk += k * k;
      sa += angle;
      ska += k * angle;
    }
    const slope = (usable * ska - sk * sa) / (usable * skk - sk * sk);
    cyclesPerSymbol += slope / (2 * Math.PI);
    phase += (sa - slope * sk) / usable;
  }
  return {
    evmRms: Math.sqrt(errorPower / referencePower),
    merDb: 10 * Math.log10(referencePower / errorPower),
    symbols: usable,
    frequencyOffsetHz: cyclesPerSymbol * symbolRate,
  };
}
