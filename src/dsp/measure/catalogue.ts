/**
 * Every readout the measure stage can produce, by its name as it appears in results: the unit, and
 * which of the stage's `measurements` turns it on. Specifications name readouts from this list, so
 * a limit on a readout that does not exist is refused when the specification is saved.
 * `level` readouts are dBFS, or dBm when the stage has a calibration offset.
 */
import type { Measurement } from '../stages/measure';

export interface ReadoutCatalogueEntry {
  name: string;
  /** The unit shown (for a level: dBFS, or dBm with a calibration). */
  unit: string;
  /** True when the unit follows the calibration (dBFS, or dBm when calibrated). */
  level: boolean;
  /** The measurement (the measure stage's option) that produces it. */
  measurement: Measurement;
  /** true: only a complex stream has it (per-channel I and Q figures, the I/Q balance); false: only a real stream; undefined: both (EVM still appears for a real stream, with the reason it has no value). */
  complex?: boolean;
}

const entry = (name: string, unit: string, measurement: Measurement, complex?: boolean): ReadoutCatalogueEntry => ({
  name,
  unit: unit.replace(/^level/, 'dBFS'),
  level: unit.startsWith('level'),
  measurement,
  ...(complex === undefined ? {} : { complex }),
});

const harmonics: ReadoutCatalogueEntry[] = [];
for (let h = 2; h <= 10; h++) harmonics.push(entry(`Harmonic ${h}`, 'dBc', 'harmonics'), entry(`Harmonic ${h} frequency`, 'Hz', 'harmonics'));

/** The readouts, in the order the measure stage lists them. */
export const READOUT_CATALOGUE: readonly ReadoutCatalogueEntry[] = [
  entry('Tone frequency', 'Hz', 'tone'),
  entry('Tone level', 'level', 'tone'),
  entry('SNR', 'dB', 'snr'),
  entry('SINAD', 'dB', 'sinad'),
  entry('ENOB', 'bits', 'enob'),
  entry('THD', 'dBc', 'thd'),
  ...harmonics,
  entry('SFDR', 'dBc', 'sfdr'),
  entry('SFDR (dBFS)', 'dBFS', 'sfdr'),
  entry('Image rejection (measured)', 'dB', 'image-rejection'),
  entry('Channel power', 'level', 'channel-power'),
  entry('Noise floor (per bin)', 'level', 'noise-floor'),
  entry('Noise spectral density', 'level/Hz', 'noise-floor'),
  entry('SNR in band', 'dB', 'band-snr'),
  entry('IMD3', 'dBc', 'imd'),
  entry('OIP3', 'level', 'imd'),
  entry('IIP3', 'level', 'imd'),
  entry('Two-tone level', 'level', 'imd'),
  entry('ACLR lower', 'dB', 'aclr'),
  entry('ACLR upper', 'dB', 'aclr'),
  entry('Occupied bandwidth (99 %)', 'Hz', 'obw'),
  entry('Occupied band lower edge', 'Hz', 'obw'),
  entry('Occupied band upper edge', 'Hz', 'obw'),
  entry('DC offset', 'FS', 'dc', false),
  entry('DC offset I', 'FS', 'dc', true),
  entry('DC offset Q', 'FS', 'dc', true),
  entry('DC offset I level', 'dBFS', 'dc', true),
  entry('DC offset Q level', 'dBFS', 'dc', true),
  entry('DC level', 'dBFS', 'dc'),
  entry('I/Q gain imbalance (I relative to Q)', 'dB', 'iq-imbalance', true),
  entry('I/Q phase imbalance', 'deg', 'iq-imbalance', true),
  entry('Image rejection', 'dB', 'iq-imbalance', true),
  entry('EVM', '%', 'evm'),
  entry('EVM (dB)', 'dB', 'evm'),
  entry('MER', 'dB', 'evm'),
  entry('Carrier offset', 'Hz', 'evm'),
  entry('Clipped samples', 'samples', 'clipping', false),
  entry('Clipped samples I', 'samples', 'clipping', true),
  entry('Clipped samples Q', 'samples', 'clipping', true),
  entry('Crest factor', 'dB', 'clipping'),
];

const byName = new Map(READOUT_CATALOGUE.map((e) => [e.name, e]));

/** The catalogue entry of a readout name, or undefined for a name the engine never produces. */
export function readoutEntry(name: string): ReadoutCatalogueEntry | undefined {
  return byName.get(name);
}

/** Names of every readout, for pickers and validation messages. */
export const READOUT_NAMES: readonly string[] = READOUT_CATALOGUE.map((e) => e.name);
