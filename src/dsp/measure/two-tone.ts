/**
 * Two-tone intermodulation: the two strongest tones, their third-order products at 2 f1 - f2 and
 * 2 f2 - f1 (folded into 0..fs/2 for real streams), and the output intercept
 * OIP3 = P + (P - P3) / 2 (B. Razavi, "RF Microelectronics", 2nd ed., 2012, ch. 2), with P the
 * mean tone level and P3 the stronger product, both as main-lobe power / ENBW.
 */
import { binOfFrequency, type MeasuredSpectrum } from './measured-spectrum';
import { findTone, lobePower, markLobe, type ToneReading } from './tone';
import { toneLeakageSpectrum } from './dynamic-range';

export interface TwoTone {
  low: ToneReading;
  high: ToneReading;
  /** Mean level of the two tones (dBFS). */
  toneLevelDbfs: number;
  /** Levels (dBFS) of the products at 2 f1 - f2 and 2 f2 - f1. */
  lowerProductDbfs: number;
  upperProductDbfs: number;
  /** Stronger product relative to the mean tone level (dBc, negative). */
  imd3Dbc: number;
  /** Output third-order intercept (dBFS). */
  oip3Dbfs: number;
  /** A product is within 10 dB of the tones' own window leakage: the intercept is a lower bound. */
  windowLimited: boolean;
}

/** Two-tone IMD readouts of the two strongest tones outside the DC lobe. */
export function twoTone(spectrum: MeasuredSpectrum): TwoTone {
  const first = findTone(spectrum);
  // The second tone: strongest peak outside the DC and first tone's lobes.
  const masked = { ...spectrum, power: Float64Array.from(spectrum.power) };
  const mask = new Uint8Array(spectrum.power.length);
  markLobe(mask, spectrum, first.bin, 2 * spectrum.mainLobeBins);
  for (let k = 0; k < mask.length; k++) if (mask[k]) masked.power[k] = 0;
  const second = findTone(masked);
  const [low, high] = first.frequency <= second.frequency ? [first, second] : [second, first];
  const products = [2 * low.frequency - high.frequency, 2 * high.frequency - low.frequency].map((f) => binOfFrequency(spectrum, f));
  for (const bin of products) {
    const clash = [low.bin, high.bin, spectrum.zeroBin].some((b) => Math.abs(b - bin) <= spectrum.mainLobeBins);
    if (clash) throw new RangeError('measurements: a third-order product falls on a tone or on 0 Hz; choose tones whose 2 f1 - f2 and 2 f2 - f1 lie apart from both');
  }
  const level = (p: number) => 10 * Math.log10(p);
  const [p3Low, p3High] = products.map((bin) => lobePower(spectrum, bin, spectrum.mainLobeBins));
  const toneLevelDbfs = (low.levelDbfs + high.levelDbfs) / 2;
  const p3 = level(Math.max(p3Low, p3High));
  const [leakLow, leakHigh] = [toneLeakageSpectrum(spectrum, low), toneLeakageSpectrum(spectrum, high)];
  const windowLimited = products.some((bin) => spectrum.power[bin] < 10 * (leakLow[bin] + leakHigh[bin]));
  return {
    low,
    high,
    toneLevelDbfs,
    lowerProductDbfs: level(p3Low),
    upperProductDbfs: level(p3High),
    imd3Dbc: p3 - toneLevelDbfs,
    oip3Dbfs: toneLevelDbfs + (toneLevelDbfs - p3) / 2,
    windowLimited,
  };
}
