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
 * Occupied bandwidth: the band outside which lies (1 - fraction)/2 of the total power on each side
 * (fraction 0.99 by default). Each bin's power is spread evenly over its width, so edges fall
 * between bin centres.
 */
export function occupiedBandwidth(spectrum: MeasuredSpectrum, fraction = 0.99): OccupiedBandwidth {
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction: must be between 0 and 1, got ${fraction}`);
  const { power, frequencies } = spectrum;
  const step = spectrum.sampleRate / spectrum.fftSize;
  let total = 0;
  for (let k = 0; k < power.length; k++) total += power[k];
  if (!(total > 0)) throw new RangeError('samples: the spectrum holds no power, so no occupied bandwidth');
  const tail = ((1 - fraction) / 2) * total;
  const edge = (target: number): number => {
    let cumulative = 0;
    for (let k = 0; k < power.length; k++) {
      if (cumulative + power[k] >= target) {
        const part = power[k] > 0 ? (target - cumulative) / power[k] : 0;
        return frequencies[k] - step / 2 + part * step;
      }
      cumulative += power[k];
    }
    return frequencies[power.length - 1] + step / 2;
  };
  const lowHz = edge(tail);
  const highHz = edge(total - tail);
  return { lowHz, highHz, bandwidthHz: highHz - lowHz };
}
