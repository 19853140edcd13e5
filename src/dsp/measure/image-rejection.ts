import type { MeasuredSpectrum } from './measured-spectrum';
import { binOfFrequency } from './measured-spectrum';
import { lobePower } from './tone';

/**
 * Image rejection ratio (dB) of a quadrature path with amplitude ratio `gainRatio` (linear, 1 =
 * balanced) and phase error `phaseRad` (radians), by the exact form
 * IRR = (1 + 2 g cos t + g^2) / (1 - 2 g cos t + g^2) (B. Razavi, "RF Microelectronics", 2nd ed.,
 * 2012, image-reject receivers). Returns Infinity for a perfectly balanced path.
 */
export function imageRejectionDb(gainRatio: number, phaseRad: number): number {
  if (!Number.isFinite(gainRatio) || gainRatio <= 0) throw new RangeError(`gainRatio: must be a finite number > 0, got ${gainRatio}`);
  if (!Number.isFinite(phaseRad)) throw new RangeError(`phaseRad: must be a finite number of radians, got ${phaseRad}`);
  const g = gainRatio;
  const s = Math.sin(phaseRad / 2);
  // 1 - 2 g cos t + g^2 written as (1 - g)^2 + 4 g sin^2(t/2): the same value without the
  // cancellation that turns a near-perfect path into 0 and an infinite ratio.
  const image = (1 - g) * (1 - g) + 4 * g * s * s;
  const wanted = (1 + g) * (1 + g) - 4 * g * s * s;
  if (image <= 0) return Infinity;
  return 10 * Math.log10(wanted / image);
}

/** Image rejection read from a complex spectrum: the tone's lobe power over that at -f (dB). */
export interface SpectralImageRejection {
  /** dB, or null with `reason`. */
  value: number | null;
  reason?: string;
  /** The image lobe is within 10 dB of the window's own leakage floor there: the figure is a lower bound. */
  windowLimited: boolean;
}

/**
 * Tone lobe power over image lobe power (dB) at -`toneHz` in a complex spectrum; not computable
 * when the tone and its image share a lobe (tone at 0 Hz or fs/2). `leakage`: the tone's own
 * window leakage per bin (display order), to tell an image from the window's skirt.
 */
export function spectralImageRejection(spectrum: MeasuredSpectrum, toneBin: number, toneHz: number, leakage: Float64Array): SpectralImageRejection {
  if (spectrum.sampleType !== 'complex') return { value: null, reason: 'needs a complex stream: a real one has no separate image', windowLimited: false };
  const imageBin = binOfFrequency(spectrum, -toneHz);
  const n = spectrum.power.length;
  const apart = Math.min(Math.abs(imageBin - toneBin), n - Math.abs(imageBin - toneBin));
  if (apart <= 2 * spectrum.mainLobeBins) {
    return {
      value: null,
      reason: 'the tone sits at 0 Hz or fs/2, where it and its image fall in the same bins; move the tone off 0 Hz and fs/2 to read the image',
      windowLimited: false,
    };
  }
  const wanted = lobePower(spectrum, toneBin, spectrum.mainLobeBins);
  const image = lobePower(spectrum, imageBin, spectrum.mainLobeBins);
  if (!(image > 0)) return { value: null, reason: 'no power at all at the image frequency', windowLimited: false };
  return { value: 10 * Math.log10(wanted / image), windowLimited: spectrum.power[imageBin] < 10 * leakage[imageBin] };
}
