/**
 * SNR, SINAD and SFDR of the strongest tone (dB, dBc), in the way ADC data sheets state them:
 * the DC lobe is never counted; harmonics 2..N of a real tone (folded into 0..fs/2) are distortion,
 * not noise; noise in the bins left out is replaced by the mean noise of the other bins.
 */
import { binOfFrequency, type MeasuredSpectrum } from './measured-spectrum';
import { getFftPlan } from '../fft/plan';
import { findTone, markLobe, type ToneReading } from './tone';

export interface DynamicRangeOptions {
  /** Highest harmonic counted as distortion for real signals (default 5; 1 = none). */
  harmonics?: number;
  /** Leave the DC lobe out of the tone search (default true). */
  excludeDc?: boolean;
}

export interface DynamicRange {
  tone: ToneReading;
  /** Noise power (linear) over the whole band, without DC, tone and harmonics. */
  noisePower: number;
  /** Harmonic distortion power (linear), noise under the harmonic lobes removed. */
  distortionPower: number;
  /** Signal-to-noise ratio (dB). */
  snrDb: number;
  /** Signal to noise-and-distortion ratio (dB). */
  sinadDb: number;
  /**
   * Carrier over the largest spur (dBc), each as its main-lobe power / ENBW (so neither scallops);
   * the spur is the strongest bin outside the DC and carrier lobes, harmonics included.
   */
  sfdrDb: number;
  /** Full-scale tone (0.5 real, 1 complex) over the largest spur (dBFS, ADC data-sheet habit). */
  sfdrDbfs: number;
  /** Frequency (Hz) of the largest spur's peak bin. */
  spurFrequency: number;
  /**
   * True when the largest spur is within 10 dB of the leakage the window's side lobes put there
   * from the carrier alone: the SFDR then tells the window, not the signal.
   */
  spurWindowLimited: boolean;
}

/**
 * Linear power the window's side lobes carry from `tone` alone into every bin (display order): a
 * lone tone's leakage, scaled to the tone's peak bin. One FFT of the window turned to the tone's
 * frequency gives W(k - f) at every bin k; a real tone adds its mirror at -f.
 */
export function toneLeakageSpectrum(spectrum: MeasuredSpectrum, tone: ToneReading): Float64Array {
  const { fftSize, sampleRate, window } = spectrum;
  const nu = (tone.frequency / sampleRate) * fftSize;
  const input = new Float64Array(2 * fftSize);
  for (let n = 0; n < window.length; n++) {
    const ph = (2 * Math.PI * nu * n) / fftSize;
    input[2 * n] = window[n] * Math.cos(ph);
    input[2 * n + 1] = window[n] * Math.sin(ph);
  }
  const x = getFftPlan(fftSize).forward(input, new Float64Array(2 * fftSize));
  const at = (m: number) => {
    const i = ((m % fftSize) + fftSize) % fftSize;
    return x[2 * i] * x[2 * i] + x[2 * i + 1] * x[2 * i + 1];
  };
  const complex = spectrum.sampleType === 'complex';
  const n = spectrum.power.length;
  const shape = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // Display bin k of a complex spectrum is natural bin k - fftSize/2; a real one's is k, plus
    // the mirror's W(k + f), which (|W| even) is natural bin -k.
    shape[k] = complex ? at(k - fftSize / 2) : at(k) + at(-k);
  }
  const reference = shape[tone.bin];
  if (!(reference > 0)) return new Float64Array(n);
  const scale = spectrum.power[tone.bin] / reference;
  for (let k = 0; k < n; k++) shape[k] *= scale;
  return shape;
}

/** SNR, SINAD and SFDR of the strongest tone of a measured spectrum. */
export function dynamicRange(spectrum: MeasuredSpectrum, options: DynamicRangeOptions = {}): DynamicRange {
  const { power, mainLobeBins: lobe, enbwBins } = spectrum;
  const excludeDc = options.excludeDc ?? true;
  const tone = findTone(spectrum, { excludeDc });
  const n = power.length;

  const dcMask = new Uint8Array(n);
  if (excludeDc) markLobe(dcMask, spectrum, spectrum.zeroBin, lobe);
  const toneMask = new Uint8Array(n);
  markLobe(toneMask, spectrum, tone.bin, lobe);

  const harmonicMask = new Uint8Array(n);
  const maxHarmonic = spectrum.sampleType === 'real' ? Math.max(1, Math.floor(options.harmonics ?? 5)) : 1;
  for (let h = 2; h <= maxHarmonic; h++) {
    const bin = binOfFrequency(spectrum, h * tone.frequency);
    markLobe(harmonicMask, spectrum, bin, lobe);
  }

  let noiseSum = 0;
  let noiseBins = 0;
  let spurBin = -1;
  for (let k = 0; k < n; k++) {
    if (dcMask[k] || toneMask[k]) continue;
    if (spurBin < 0 || power[k] > power[spurBin]) spurBin = k;
    if (harmonicMask[k]) continue;
    noiseSum += power[k];
    noiseBins++;
  }
  if (noiseBins === 0 || spurBin < 0) throw new RangeError('fftSize: too small to leave any noise bins outside the tone, harmonic and DC lobes');
  const noisePerBin = noiseSum / noiseBins;
  const noisePower = (noisePerBin * n) / enbwBins;

  let harmonicSum = 0;
  let harmonicBins = 0;
  for (let k = 0; k < n; k++) {
    if (harmonicMask[k] && !dcMask[k] && !toneMask[k]) {
      harmonicSum += power[k];
      harmonicBins++;
    }
  }
  const distortionPower = Math.max(0, (harmonicSum - noisePerBin * harmonicBins) / enbwBins);
  // The spur's lobe stops where the carrier's or the DC lobe begins, so none is counted twice.
  const spurMask = new Uint8Array(n);
  markLobe(spurMask, spectrum, spurBin, lobe);
  let spurSum = 0;
  let leakSum = 0;
  const leakage = toneLeakageSpectrum(spectrum, tone);
  for (let k = 0; k < n; k++) {
    if (!spurMask[k] || dcMask[k] || toneMask[k]) continue;
    spurSum += power[k];
    leakSum += leakage[k];
  }
  const spurPower = spurSum / enbwBins;
  const fullScale = spectrum.sampleType === 'real' ? 0.5 : 1;
  return {
    tone,
    noisePower,
    distortionPower,
    snrDb: 10 * Math.log10(tone.power / noisePower),
    sinadDb: 10 * Math.log10(tone.power / (noisePower + distortionPower)),
    sfdrDb: 10 * Math.log10(tone.power / spurPower),
    sfdrDbfs: 10 * Math.log10(fullScale / spurPower),
    spurFrequency: spectrum.frequencies[spurBin],
    spurWindowLimited: spurSum < 10 * leakSum,
  };
}
