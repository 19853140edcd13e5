/**
 * The measure stage's readout table from what it gathered: a measuring spectrum, sample moments,
 * overload counts and the last samples for the sine fit. Every readout asked for appears: a value
 * that cannot be computed is null with the reason in words, never +/-Infinity or NaN.
 */
import type { Readout, ReadoutFlag } from '../types';
import type { MeasuredSpectrum } from '../measure/measured-spectrum';
import type { SampleMoments } from '../measure/sample-moments';
import type { ClippingCounter } from '../measure/clipping';
import { findTone, lobePower, markLobe, type ToneReading } from '../measure/tone';
import { dynamicRange, toneLeakageSpectrum } from '../measure/dynamic-range';
import { channelPower, occupiedBandwidth } from '../measure/band';
import { imageRejectionDb, spectralImageRejection } from '../measure/image-rejection';
import type { SineFit } from '../measure/sine-fit';
import { fitOf, fitReadouts, harmonicReadouts } from './measure-fit-readouts';
import { notComputable, readout } from '../measure/readout';
import { noiseReadouts } from './measure-noise-readouts';
import { measureEvm } from '../measure/evm';
import type { DigitalModulation } from '../synth/constellation';

/** Name of the gain imbalance readout: Q is the reference, so + dB means I is the stronger channel. */
export const GAIN_IMBALANCE = 'I/Q gain imbalance (I relative to Q)';

/** What the readouts are built from. */
export interface MeasureInputs {
  measurements: readonly string[];
  complex: boolean;
  sampleRate: number;
  fftSize: number;
  window: string;
  harmonics: number;
  calibrationDb: number;
  bandLow?: number;
  bandHigh?: number;
  aclrSpacing?: number;
  imdGainDb?: number;
  /** EVM settings (symbol rate in Hz, modulation, roll-off), when evm is asked for. */
  evm?: { symbolRate: number; modulation: DigitalModulation; rollOff: number };
  /** Samples (complex samples for complex streams) that went through the stage. */
  samples: number;
  spectrum: MeasuredSpectrum | null;
  moments: SampleMoments;
  clipping: ClippingCounter;
  /** The last samples of the stream (interleaved for complex), for the sine fit; null when not kept. */
  fitSamples: Float32Array | null;
}

/** Fewest samples that make a spectrum worth reading. */
export const MIN_SPECTRUM_SAMPLES = 16;

const TONE_AT_DC =
  'the strongest component lies in the 0 Hz lobe, where a tone cannot be told from a DC offset; tone readouts that separate tone from noise need the tone off 0 Hz (shift it with an NCO or mix stage), or remove the DC offset first if that is what it is';

interface ToneContext {
  tone: ToneReading;
  /** The strongest component is in the DC lobe. */
  atDc: boolean;
  /** The tone stands 20 dB or more above the mean bin: a tone, not the largest noise bin. */
  prominent: boolean;
}

function toneContext(spectrum: MeasuredSpectrum): ToneContext {
  const outside = findTone(spectrum);
  const dc = lobePower(spectrum, spectrum.zeroBin, spectrum.mainLobeBins);
  const atDc = dc > outside.power;
  const tone = atDc ? findTone(spectrum, { excludeDc: false }) : outside;
  let mean = 0;
  for (let k = 0; k < spectrum.power.length; k++) mean += spectrum.power[k];
  mean /= spectrum.power.length;
  return { tone, atDc, prominent: spectrum.power[tone.bin] > 100 * mean };
}

/** The readouts of a finished measure stage. */
export function measureReadouts(inputs: MeasureInputs): Readout[] {
  const { complex, spectrum, moments, clipping, calibrationDb: cal } = inputs;
  const wanted = new Set(inputs.measurements);
  const level = cal !== 0 ? 'dBm' : 'dBFS';
  const out: Readout[] = [];

  // One reason for everything when there is nothing to measure.
  let dead: string | null = null;
  if (inputs.samples === 0) dead = 'the stream held no samples';
  else if (clipping.peak === 0) dead = 'every sample is 0: there is no signal to measure';
  const shortReason = `${inputs.samples} samples are too few for a spectrum (at least ${MIN_SPECTRUM_SAMPLES})`;
  const spectral = dead ?? (spectrum && inputs.samples >= MIN_SPECTRUM_SAMPLES ? null : shortReason);

  const common: ReadoutFlag[] = [];
  if (clipping.clipped.some((c) => c > 0)) common.push('clipped');
  const spectralFlags: ReadoutFlag[] = [...common];
  // A stream shorter than one segment was analysed with a shorter window: its start-up dominates.
  if (inputs.samples < inputs.fftSize) spectralFlags.push('start-up-transient');

  /** Names and units of a group, emitted as not computable (with `reason`) when the group cannot run. */
  const group = (names: [string, string][], reason: string | null, body: () => Readout[]) => {
    if (reason !== null) {
      for (const [name, unit] of names) out.push(notComputable(name, unit, reason));
      return;
    }
    try {
      out.push(...body());
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
      for (const [name, unit] of names) out.push(notComputable(name, unit, error.message));
    }
  };

  let context: ToneContext | null = null;
  if (spectral === null && spectrum) {
    try {
      context = toneContext(spectrum);
    } catch (error) {
      if (!(error instanceof RangeError)) throw error;
    }
  }
  const toneReason = spectral ?? (context ? null : 'no bins left outside the DC lobe to search for a tone (FFT size too small)');

  if (wanted.has('tone')) {
    group([['Tone frequency', 'Hz'], ['Tone level', level]], toneReason, () => {
      const { tone, atDc } = context!;
      const flags: ReadoutFlag[] = atDc ? [...spectralFlags, 'tone-at-dc'] : spectralFlags;
      return [
        readout('Tone frequency', tone.frequency, 'Hz', { flags, definition: 'tone-frequency-interpolated' }),
        readout('Tone level', tone.levelDbfs + cal, level, { flags, definition: 'tone-lobe-power' }),
      ];
    });
  }

  const fitWanted = ['snr', 'sinad', 'enob', 'thd', 'harmonics'].some((m) => wanted.has(m));
  if (fitWanted) {
    const names: [string, string][] = [];
    if (wanted.has('snr')) names.push(['SNR', 'dB']);
    if (wanted.has('sinad')) names.push(['SINAD', 'dB']);
    if (wanted.has('enob')) names.push(['ENOB', 'bits']);
    if (wanted.has('thd')) names.push(['THD', 'dBc']);
    const harmonicNames: [string, string][] = [];
    if (wanted.has('harmonics')) {
      for (let h = 2; h <= Math.max(2, Math.min(inputs.harmonics, 10)); h++) harmonicNames.push([`Harmonic ${h}`, 'dBc'], [`Harmonic ${h} frequency`, 'Hz']);
    }
    const fitReason = toneReason ?? (context!.atDc ? TONE_AT_DC : inputs.fitSamples ? null : 'no samples were kept for the sine fit');
    // One fit shared by both groups, made only when one of them runs.
    let fit: SineFit | null | undefined;
    const getFit = () => (fit === undefined ? (fit = fitOf(inputs, context!.tone)) : fit);
    group(names, fitReason, () => fitReadouts(inputs, getFit(), names, common));
    if (harmonicNames.length > 0) {
      group(harmonicNames, fitReason ?? (complex ? 'harmonics are read on real streams only (a complex tone has no folded harmonics)' : null), () =>
        harmonicReadouts(inputs, getFit(), common),
      );
    }
  }

  if (wanted.has('sfdr')) {
    group([['SFDR', 'dBc'], ['SFDR (dBFS)', 'dBFS']], toneReason ?? (context!.atDc ? TONE_AT_DC : null), () => {
      const r = dynamicRange(spectrum!, { harmonics: inputs.harmonics });
      const limited = `the largest spur (${r.spurFrequency.toPrecision(7)} Hz) is within 10 dB of the ${inputs.window} window's own leakage from the carrier, so the true SFDR is better than this window can show; use window 'kaiser' with beta 20 or more`;
      const extras = r.spurWindowLimited ? { flags: [...spectralFlags, 'window-limited' as const], reason: limited } : { flags: spectralFlags };
      return [
        readout('SFDR', r.spurWindowLimited ? null : r.sfdrDb, 'dBc', { ...extras, definition: 'sfdr-lobe-power' }),
        readout('SFDR (dBFS)', r.spurWindowLimited ? null : r.sfdrDbfs, 'dBFS', { ...extras, definition: 'sfdr-dbfs-lobe-power' }),
      ];
    });
  }

  if (wanted.has('image-rejection')) {
    const reason = toneReason ?? (complex ? (context!.atDc ? TONE_AT_DC : null) : 'needs a complex stream: a real one has no separate image');
    group([['Image rejection (measured)', 'dB']], reason, () => {
      const { tone } = context!;
      const r = spectralImageRejection(spectrum!, tone.bin, tone.frequency, toneLeakageSpectrum(spectrum!, tone));
      const flags: ReadoutFlag[] = r.windowLimited ? [...spectralFlags, 'window-limited'] : spectralFlags;
      const reasonLimited = `the image lies within 10 dB of the ${inputs.window} window's leakage from the tone: the true rejection is higher; use window 'kaiser' with beta 20 or more`;
      return [readout('Image rejection (measured)', r.windowLimited ? null : r.value, 'dB', { flags, definition: 'irr-spectral', reason: r.windowLimited ? reasonLimited : r.reason })];
    });
  }

  if (wanted.has('channel-power') && inputs.bandLow !== undefined && inputs.bandHigh !== undefined) {
    const [low, high] = [inputs.bandLow, inputs.bandHigh];
    group([['Channel power', level]], spectral, () => {
      const p = channelPower(spectrum!, low, high);
      return [readout('Channel power', p > 0 ? 10 * Math.log10(p) + cal : null, level, { flags: spectralFlags, definition: 'channel-power-welch', reason: 'no power at all in the band' })];
    });
  }

  out.push(
    ...noiseReadouts({
      wanted,
      spectrum,
      spectralReason: spectral,
      tone: context && !context.atDc ? context.tone : null,
      toneReason: toneReason ?? (context!.atDc ? TONE_AT_DC : null),
      flags: spectralFlags,
      harmonics: inputs.harmonics,
      window: inputs.window,
      calibrationDb: cal,
      bandLow: inputs.bandLow,
      bandHigh: inputs.bandHigh,
      aclrSpacing: inputs.aclrSpacing,
      imdGainDb: inputs.imdGainDb,
    }),
  );

  if (wanted.has('obw')) {
    const names: [string, string][] = [['Occupied bandwidth (99 %)', 'Hz'], ['Occupied band lower edge', 'Hz'], ['Occupied band upper edge', 'Hz']];
    group(names, spectral, () => {
      // The DC/LO lobe is left out as the tone readouts leave it out, however strong (LO leakage
      // can outweigh the signal); only a stream with nothing else is measured with it.
      const exclude = new Uint8Array(spectrum!.power.length);
      markLobe(exclude, spectrum!, spectrum!.zeroBin, spectrum!.mainLobeBins);
      let rest = 0;
      for (let k = 0; k < exclude.length; k++) if (!exclude[k]) rest += spectrum!.power[k];
      const onlyDc = !(rest > 0);
      const obw = occupiedBandwidth(spectrum!, 0.99, onlyDc ? undefined : exclude);
      const extras = { flags: onlyDc ? [...spectralFlags, 'tone-at-dc' as const] : spectralFlags, definition: 'obw-itu-sm328' };
      return [readout(names[0][0], obw.bandwidthHz, 'Hz', extras), readout(names[1][0], obw.lowHz, 'Hz', extras), readout(names[2][0], obw.highHz, 'Hz', extras)];
    });
  }

  if (wanted.has('dc')) {
    const names: [string, string][] = complex
      ? [['DC offset I', 'FS'], ['DC offset Q', 'FS'], ['DC offset I level', 'dBFS'], ['DC offset Q level', 'dBFS'], ['DC level', 'dBFS']]
      : [['DC offset', 'FS'], ['DC level', 'dBFS']];
    group(names, dead, () => {
      const flags: ReadoutFlag[] = context?.atDc ? [...common, 'holds-tone'] : common;
      const { dcI, dcQ } = moments.means();
      const dbOf = (v: number) => (v !== 0 ? 20 * Math.log10(Math.abs(v)) : null);
      const zero = 'the mean is exactly 0: no DC offset to put on a dB scale';
      const extras = { flags, definition: 'dc-mean' };
      if (!complex) return [readout('DC offset', dcI, 'FS', extras), readout('DC level', dbOf(dcI), 'dBFS', { ...extras, reason: zero })];
      return [
        readout('DC offset I', dcI, 'FS', extras),
        readout('DC offset Q', dcQ, 'FS', extras),
        readout('DC offset I level', dbOf(dcI), 'dBFS', { ...extras, reason: zero }),
        readout('DC offset Q level', dbOf(dcQ), 'dBFS', { ...extras, reason: zero }),
        readout('DC level', dbOf(Math.hypot(dcI, dcQ)), 'dBFS', { ...extras, reason: zero }),
      ];
    });
  }

  if (wanted.has('iq-imbalance') && complex) {
    const names: [string, string][] = [[GAIN_IMBALANCE, 'dB'], ['I/Q phase imbalance', 'deg'], ['Image rejection', 'dB']];
    group(names, dead, () => {
      const { ii, qq } = moments.centredPowers();
      if (!(ii > 0) || !(qq > 0)) {
        const which = !(ii > 0) && !(qq > 0) ? 'neither I nor Q carries' : !(ii > 0) ? 'I carries' : 'Q carries';
        const reason = `${which} any power once its mean is removed, so no balance can be estimated`;
        return names.map(([name, unit]) => notComputable(name, unit, reason));
      }
      const e = moments.imbalance();
      const flags: ReadoutFlag[] = [...common];
      // The blind estimate assumes I and Q uncorrelated with equal power, which a tone at 0 Hz or fs/2 breaks.
      if (context && context.prominent) {
        const nearNyquist = Math.abs(Math.abs(context.tone.frequency) - inputs.sampleRate / 2) <= ((spectrum!.mainLobeBins + 1) * inputs.sampleRate) / inputs.fftSize;
        if (context.atDc || nearNyquist) flags.push('assumption-fails');
      }
      const irr = imageRejectionDb(e.gainRatio, e.phaseRad);
      return [
        // Ellingson's g is I's amplitude over Q's: positive when I is the stronger channel.
        readout(GAIN_IMBALANCE, 20 * Math.log10(e.gainRatio), 'dB', { flags, definition: 'iq-gain-ellingson' }),
        readout('I/Q phase imbalance', (e.phaseRad * 180) / Math.PI, 'deg', { flags, definition: 'iq-phase-ellingson' }),
        readout('Image rejection', irr, 'dB', { flags, definition: 'irr-blind', reason: 'I and Q match exactly in gain and phase: the estimate leaves no image' }),
      ];
    });
  }

  if (wanted.has('evm')) {
    const names: [string, string][] = [['EVM', '%'], ['EVM (dB)', 'dB'], ['MER', 'dB'], ['Carrier offset', 'Hz']];
    const reason = dead ?? (!complex ? 'needs a complex stream with the carrier at 0 Hz' : !inputs.evm ? 'needs symbolRate' : !inputs.fitSamples ? 'no samples were kept' : null);
    group(names, reason, () => {
      const r = measureEvm(inputs.fitSamples!, { sampleRate: inputs.sampleRate, ...inputs.evm! });
      const extras = { flags: common, reason: 'no error at all (a noise-free synthetic carrier)' };
      return [
        readout('EVM', 100 * r.evmRms, '%', { ...extras, definition: 'evm-rms' }),
        readout('EVM (dB)', r.evmRms > 0 ? 20 * Math.log10(r.evmRms) : null, 'dB', { ...extras, definition: 'evm-rms' }),
        readout('MER', r.merDb, 'dB', { ...extras, definition: 'mer' }),
        readout('Carrier offset', r.frequencyOffsetHz, 'Hz', { flags: common, definition: 'evm-carrier-offset' }),
      ];
    });
  }

  if (wanted.has('clipping')) {
    const names: [string, string][] = complex
      ? [['Clipped samples I', 'samples'], ['Clipped samples Q', 'samples'], ['Crest factor', 'dB']]
      : [['Clipped samples', 'samples'], ['Crest factor', 'dB']];
    group(names, inputs.samples === 0 ? 'the stream held no samples' : null, () => {
      const counts = clipping.clipped.map((c, i) => readout(names[i][0], c, 'samples', { definition: 'clipped-count' }));
      return [...counts, readout('Crest factor', clipping.crestFactorDb(), 'dB', { definition: 'crest-factor', reason: 'every sample is 0: no RMS to divide by' })];
    });
  }
  return out;
}
