/** Band readouts: channel power in a band and occupied bandwidth. */
import type { MeasuredSpectrum } from './measured-spectrum';

/**
 * Power (linear, full scale 1.0) in [lowHz, highHz]: the power density integrated over the bins
 * whose centre lies in the band (resolution fs/fftSize).
 */
export function channelPower(spectrum: MeasuredSpectrum, lowHz: number, highHz: number): number {
  if (!Number.isFinite(lowHz) || !Number.isFinite(highHz)) throw new RangeError('bandLow/bandHigh: must be finite frequencies in Hz');
  if (!(highHz > lowHz)) throw new RangeError(`bandHigh: must be above bandLow (${lowHz} Hz), got ${highHz} Hz`);
  let sum = 0;
  let bins = 0;
  for (let k = 0; k < spectrum.power.length; k++) {
    const f = spectrum.frequencies[k];
    if (f >= lowHz && f <= highHz) {
      sum += spectrum.power[k];
      bins++;
    }
  }
  if (bins === 0) throw new RangeError(`bandLow/bandHigh: the band ${lowHz} to ${highHz} Hz holds no bin of the spectrum`);
  // 'spectrum' scaling counts every noise bin ENBW times over; dividing restores density x bandwidth.
  return sum / spectrum.enbwBins;
}

export interface OccupiedBandwidth {
  /** Lower edge (Hz). */
  lowHz: number;
  /** Upper edge (Hz). */
  highHz: number;
  /** highHz - lowHz (Hz). */
  bandwidthHz: number;
}

/**
 * Occupied bandwidth (ITU-R SM.328; Radio Regulations Art. 1.153): the band outside which lies
 * (1 - fraction)/2 of the total power on each side (fraction 0.99 by default). Each bin's power is
 * spread evenly over its width, so edges fall between bin centres. `excludeBins` (display order)
 * are left out of the power, e.g. the DC/LO lobe. A complex spectrum is a circle: the sum starts
 * opposite the power's centre, so a signal across +/- fs/2 is measured whole, and edges are
 * wrapped back into -fs/2..fs/2 (lowHz > highHz then says the band crosses fs/2). A real spectrum
 * stays within 0..fs/2.
 */
export function occupiedBandwidth(spectrum: MeasuredSpectrum, fraction = 0.99, excludeBins?: Uint8Array): OccupiedBandwidth {
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction: must be between 0 and 1, got ${fraction}`);
  const { frequencies, sampleRate } = spectrum;
  const n = spectrum.power.length;
  const step = sampleRate / spectrum.fftSize;
  const power = Float64Array.from(spectrum.power);
  if (excludeBins) for (let k = 0; k < n; k++) if (excludeBins[k]) power[k] = 0;
  let total = 0;
  for (let k = 0; k < n; k++) total += power[k];
  if (!(total > 0)) throw new RangeError('samples: the spectrum holds no power, so no occupied bandwidth');
  const complex = spectrum.sampleType === 'complex';
  let start = 0;
  if (complex) {
    let c = 0;
    let s = 0;
    for (let k = 0; k < n; k++) {
      const a = (2 * Math.PI * k) / n;
      c += power[k] * Math.cos(a);
      s += power[k] * Math.sin(a);
    }
    const centre = Math.round((Math.atan2(s, c) / (2 * Math.PI)) * n);
    start = (((centre + n / 2) % n) + n) % n;
  }
  const freqAt = (j: number) => frequencies[start] + j * step;
  const tail = ((1 - fraction) / 2) * total;
  const edge = (target: number): number => {
    let cumulative = 0;
    for (let j = 0; j < n; j++) {
      const p = power[(start + j) % n];
      if (cumulative + p >= target) {
        const part = p > 0 ? (target - cumulative) / p : 0;
        return freqAt(j) - step / 2 + part * step;
      }
      cumulative += p;
    }
    return freqAt(n - 1) + step / 2;
  };
  let lowHz = edge(tail);
  let highHz = edge(total - tail);
  const bandwidthHz = highHz - lowHz;
  if (complex) {
    const wrap = (f: number) => f - sampleRate * Math.floor((f + sampleRate / 2) / sampleRate);
    lowHz = wrap(lowHz);
    highHz = wrap(highHz);
  } else {
    lowHz = Math.max(0, lowHz);
    highHz = Math.min(sampleRate / 2, highHz);
  }
  return { lowHz, highHz, bandwidthHz: complex ? bandwidthHz : highHz - lowHz };
}

export interface AdjacentChannelRatios {
  /** Channel power over the lower adjacent channel (dB), or null with `lowerReason`. */
  lowerDb: number | null;
  lowerReason?: string;
  /** Channel power over the upper adjacent channel (dB), or null with `upperReason`. */
  upperDb: number | null;
  upperReason?: string;
}

/**
 * ACLR (3GPP TS 36.141 / 38.141 definition): power in the channel [lowHz, highHz] over the power in
 * the same-width channel `spacingHz` below and above it, each integrated over its bins (dB). A
 * neighbour reaching outside the spectrum (beyond +/- fs/2, or below 0 Hz for real streams) or
 * holding no power is not computable.
 */
export function adjacentChannelRatios(spectrum: MeasuredSpectrum, lowHz: number, highHz: number, spacingHz: number): AdjacentChannelRatios {
  const main = channelPower(spectrum, lowHz, highHz);
  const nyquist = spectrum.sampleRate / 2;
  const lowest = spectrum.sampleType === 'complex' ? -nyquist : 0;
  const side = (offset: number): { db: number | null; reason?: string } => {
    const [lo, hi] = [lowHz + offset, highHz + offset];
    if (lo < lowest || hi > nyquist) return { db: null, reason: `the adjacent channel ${lo} to ${hi} Hz reaches beyond the spectrum (${lowest} to ${nyquist} Hz)` };
    const p = channelPower(spectrum, lo, hi);
    if (!(p > 0) || !(main > 0)) return { db: null, reason: 'no power in the channel or its neighbour' };
    return { db: 10 * Math.log10(main / p) };
  };
  const lower = side(-spacingHz);
  const upper = side(spacingHz);
  return { lowerDb: lower.db, lowerReason: lower.reason, upperDb: upper.db, upperReason: upper.reason };
}
