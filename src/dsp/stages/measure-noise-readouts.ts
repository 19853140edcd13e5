/**
 * The measure stage's noise, band and two-tone readouts (noise floor and density, SNR in a band,
 * two-tone IMD with OIP3/IIP3, ACLR), each null with a reason when it cannot be formed.
 */
import type { Readout, ReadoutFlag } from '../types';
import type { MeasuredSpectrum } from '../measure/measured-spectrum';
import type { ToneReading } from '../measure/tone';
import { bandSnrDb, noiseFloor, signalMask } from '../measure/noise';
import { twoTone } from '../measure/two-tone';
import { adjacentChannelRatios } from '../measure/band';
import { notComputable, readout } from '../measure/readout';

export interface NoiseReadoutInputs {
  wanted: Set<string>;
  spectrum: MeasuredSpectrum | null;
  /** Why no spectral readout can be formed, or null. */
  spectralReason: string | null;
  /** The strongest tone outside DC, or null (none, or it sits at 0 Hz). */
  tone: ToneReading | null;
  /** Why tone-based readouts cannot be formed, or null. */
  toneReason: string | null;
  flags: ReadoutFlag[];
  harmonics: number;
  window: string;
  calibrationDb: number;
  bandLow?: number;
  bandHigh?: number;
  aclrSpacing?: number;
  imdGainDb?: number;
}

const LEAKY = "use window 'kaiser' with beta 20 or more";

/** Runs `body`, or reports each of `names` as not computable with the RangeError's message. */
function guarded(names: [string, string][], reason: string | null, body: () => Readout[]): Readout[] {
  if (reason !== null) return names.map(([n, u]) => notComputable(n, u, reason));
  try {
    return body();
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    return names.map(([n, u]) => notComputable(n, u, error.message));
  }
}

/** Readouts of noise-floor, band-snr, imd and aclr, in that order, for those asked for. */
export function noiseReadouts(inputs: NoiseReadoutInputs): Readout[] {
  const { wanted, spectrum, flags, calibrationDb: cal } = inputs;
  const level = cal !== 0 ? 'dBm' : 'dBFS';
  const out: Readout[] = [];
  const dB = (p: number) => (p > 0 ? 10 * Math.log10(p) : null);

  if (wanted.has('noise-floor')) {
    const names: [string, string][] = [['Noise floor (per bin)', level], ['Noise spectral density', `${level}/Hz`]];
    out.push(
      ...guarded(names, inputs.spectralReason, () => {
        const mask = signalMask(spectrum!, inputs.tone, inputs.harmonics);
        const floor = noiseFloor(spectrum!, mask, inputs.tone);
        const limited = floor.leakageShare > 0.1;
        const reason = limited ? `the tone's leakage through the ${inputs.window} window reaches the noise bins, so the floor shown would be the window's; ${LEAKY}` : 'no noise at all outside the tone';
        const f: ReadoutFlag[] = limited ? [...flags, 'window-limited'] : flags;
        const value = (p: number) => (limited ? null : dB(p));
        return [
          readout(names[0][0], value(floor.perBin) === null ? null : value(floor.perBin)! + cal, level, { flags: f, definition: 'noise-floor-bin', reason }),
          readout(names[1][0], value(floor.densityPerHz) === null ? null : value(floor.densityPerHz)! + cal, `${level}/Hz`, { flags: f, definition: 'noise-density', reason }),
        ];
      }),
    );
  }

  if (wanted.has('band-snr') && inputs.bandLow !== undefined && inputs.bandHigh !== undefined) {
    const [low, high] = [inputs.bandLow, inputs.bandHigh];
    out.push(
      ...guarded([['SNR in band', 'dB']], inputs.toneReason, () => {
        const mask = signalMask(spectrum!, inputs.tone, inputs.harmonics);
        return [readout('SNR in band', bandSnrDb(spectrum!, inputs.tone!, mask, low, high), 'dB', { flags, definition: 'snr-band', reason: 'no noise at all in the band' })];
      }),
    );
  }

  if (wanted.has('imd')) {
    const names: [string, string][] = [['IMD3', 'dBc'], ['OIP3', level], ['IIP3', level], ['Two-tone level', level]];
    out.push(
      ...guarded(names, inputs.spectralReason, () => {
        const r = twoTone(spectrum!);
        const reason = `a third-order product lies within 10 dB of the two tones' leakage through the ${inputs.window} window, so the intercept shown would be the window's; ${LEAKY}`;
        const f: ReadoutFlag[] = r.windowLimited ? [...flags, 'window-limited'] : flags;
        const held = (v: number) => (r.windowLimited ? null : v);
        const iip3Reason = r.windowLimited ? reason : 'needs the gain up to this point (set imdGainDb): IIP3 = OIP3 - gain';
        return [
          readout('IMD3', held(r.imd3Dbc), 'dBc', { flags: f, definition: 'imd3-two-tone', reason }),
          readout('OIP3', held(r.oip3Dbfs + cal), level, { flags: f, definition: 'oip3-two-tone', reason }),
          readout('IIP3', inputs.imdGainDb === undefined ? null : held(r.oip3Dbfs + cal - inputs.imdGainDb), level, { flags: f, definition: 'iip3-two-tone', reason: iip3Reason }),
          readout('Two-tone level', r.toneLevelDbfs + cal, level, { flags, definition: 'two-tone-level' }),
        ];
      }),
    );
  }

  if (wanted.has('aclr') && inputs.bandLow !== undefined && inputs.bandHigh !== undefined) {
    const [low, high] = [inputs.bandLow, inputs.bandHigh];
    const names: [string, string][] = [['ACLR lower', 'dB'], ['ACLR upper', 'dB']];
    out.push(
      ...guarded(names, inputs.spectralReason, () => {
        const r = adjacentChannelRatios(spectrum!, low, high, inputs.aclrSpacing ?? high - low);
        return [
          readout('ACLR lower', r.lowerDb, 'dB', { flags, definition: 'aclr', reason: r.lowerReason }),
          readout('ACLR upper', r.upperDb, 'dB', { flags, definition: 'aclr', reason: r.upperReason }),
        ];
      }),
    );
  }
  return out;
}
