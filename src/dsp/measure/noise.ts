/**
 * Noise readouts of a measured spectrum: the mean noise per bin away from DC, the strongest tone
 * and its harmonics, as a spectral density (per Hz), and the SNR within a band.
 */
import { binOfFrequency, type MeasuredSpectrum } from './measured-spectrum';
import { markLobe, type ToneReading } from './tone';
import { toneLeakageSpectrum } from './dynamic-range';

export interface NoiseFloor {
  /** Mean noise power in one bin as a bin of the spectrum shows it (linear, 'spectrum' scaling). */
  perBin: number;
  /** Noise power spectral density (linear per Hz): one-sided for real streams, two-sided for complex. */
  densityPerHz: number;
  /** The tone's window leakage averaged over the noise bins, as a share of `perBin`. */
  leakageShare: number;
}

/** Bins (display order) that are not noise: DC, the tone and, for real streams, harmonics 2..h. */
export function signalMask(spectrum: MeasuredSpectrum, tone: ToneReading | null, harmonics: number): Uint8Array {
  const mask = new Uint8Array(spectrum.power.length);
  const lobe = spectrum.mainLobeBins;
  markLobe(mask, spectrum, spectrum.zeroBin, lobe);
  if (tone) {
    markLobe(mask, spectrum, tone.bin, lobe);
    if (spectrum.sampleType === 'real') for (let h = 2; h <= harmonics; h++) markLobe(mask, spectrum, binOfFrequency(spectrum, h * tone.frequency), lobe);
  }
  return mask;
}

/**
 * Noise floor: mean power of the bins outside `mask` (the noise of a bin), and the density it
 * implies, per bin / (ENBW x bin width) (scipy.signal.welch: 'spectrum' = 'density' x fs sum(w^2) / sum(w)^2).
 */
export function noiseFloor(spectrum: MeasuredSpectrum, mask: Uint8Array, tone: ToneReading | null): NoiseFloor {
  let sum = 0;
  let bins = 0;
  for (let k = 0; k < mask.length; k++) {
    if (mask[k]) continue;
    sum += spectrum.power[k];
    bins++;
  }
  if (bins === 0) throw new RangeError('fftSize: too small to leave any noise bins outside the tone and DC lobes');
  const perBin = sum / bins;
  const binWidth = spectrum.sampleRate / spectrum.fftSize;
  // The real spectrum's bins already hold both halves (one-sided); a complex one is two-sided.
  const densityPerHz = perBin / (spectrum.enbwBins * binWidth);
  let leak = 0;
  if (tone) {
    const leakage = toneLeakageSpectrum(spectrum, tone);
    for (let k = 0; k < mask.length; k++) if (!mask[k]) leak += leakage[k];
  }
  return { perBin, densityPerHz, leakageShare: perBin > 0 ? leak / bins / perBin : 0 };
}

/**
 * SNR (dB) within [lowHz, highHz]: the tone's power over the noise of the band's bins outside the
 * tone, DC and harmonic lobes, scaled to the whole band (mean per bin x band bins / ENBW).
 */
export function bandSnrDb(spectrum: MeasuredSpectrum, tone: ToneReading, mask: Uint8Array, lowHz: number, highHz: number): number {
  if (!(tone.frequency >= lowHz && tone.frequency <= highHz)) {
    throw new RangeError(`bandLow/bandHigh: the tone at ${tone.frequency.toPrecision(7)} Hz lies outside the band ${lowHz} to ${highHz} Hz`);
  }
  let sum = 0;
  let noiseBins = 0;
  let bandBins = 0;
  for (let k = 0; k < spectrum.power.length; k++) {
    const f = spectrum.frequencies[k];
    if (f < lowHz || f > highHz) continue;
    bandBins++;
    if (mask[k]) continue;
    sum += spectrum.power[k];
    noiseBins++;
  }
  if (noiseBins === 0) throw new RangeError('bandLow/bandHigh: the band holds no noise bins outside the tone lobe; widen it or raise fftSize');
  const noise = ((sum / noiseBins) * bandBins) / spectrum.enbwBins;
  return 10 * Math.log10(tone.power / noise);
}
