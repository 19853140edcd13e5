/**
 * SNR, SINAD and SFDR of the strongest tone (dB, dBc), in the way ADC data sheets state them:
 * the DC lobe is never counted; harmonics 2..N of a real tone (folded into 0..fs/2) are distortion,
 * not noise; noise in the bins left out is replaced by the mean noise of the other bins.
 */
import { binOfFrequency, type MeasuredSpectrum } from './measured-spectrum';
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
  /** Tone peak bin over the highest other bin outside the DC and tone lobes (dBc). */
  sfdrDb: number;
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
  let spur = 0;
  for (let k = 0; k < n; k++) {
    if (dcMask[k] || toneMask[k]) continue;
    if (power[k] > spur) spur = power[k];
    if (harmonicMask[k]) continue;
    noiseSum += power[k];
    noiseBins++;
  }
  if (noiseBins === 0) throw new RangeError('fftSize: too small to leave any noise bins outside the tone, harmonic and DC lobes');
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
  const tonePeak = power[tone.bin];
  return {
    tone,
    noisePower,
    distortionPower,
    snrDb: 10 * Math.log10(tone.power / noisePower),
    sinadDb: 10 * Math.log10(tone.power / (noisePower + distortionPower)),
    sfdrDb: spur > 0 ? 10 * Math.log10(tonePeak / spur) : Infinity,
  };
}
