/**
 * measure: readouts of the stream, passed through unchanged. Spectral readouts (tone, SNR, SINAD,
 * SFDR, channel power, occupied bandwidth) come from a mean Welch spectrum with 'spectrum' scaling;
 * DC offset and the blind I/Q imbalance estimate (Ellingson 2003) from running sample moments, so
 * memory does not grow with the stream.
 */
import { z } from 'zod';
import type { ChainIssue, Readout, StageDefinition, StreamFormat } from '../types';
import { createMeasuringWelch, measuredSpectrum, type MeasuredSpectrum } from '../measure/measured-spectrum';
import { SampleMoments, dcLevelDbfs } from '../measure/sample-moments';
import { findTone } from '../measure/tone';
import { dynamicRange } from '../measure/dynamic-range';
import { channelPower, occupiedBandwidth } from '../measure/band';
import { imageRejectionDb } from '../measure/image-rejection';
import { betaField, betaSchema, calibrationField, calibrationSchema, fftSizeField, fftSizeSchema, windowField, windowSchema } from './spectral-params';

export const MEASUREMENTS = ['tone', 'snr', 'sinad', 'sfdr', 'channel-power', 'obw', 'dc', 'iq-imbalance'] as const;
export type Measurement = (typeof MEASUREMENTS)[number];

export const measureSchema = z
  .object({
    measurements: z.array(z.enum(MEASUREMENTS)).min(1).default(['tone', 'snr', 'sinad', 'sfdr', 'dc']),
    fftSize: fftSizeSchema(8192, 1 << 18),
    window: windowSchema.default('blackman-harris'),
    beta: betaSchema,
    bandLow: z.number().finite().optional(),
    bandHigh: z.number().finite().optional(),
    harmonics: z.number().int().min(1).max(20).default(5),
    calibrationDb: calibrationSchema,
  })
  .strict()
  .superRefine((p, ctx) => {
    if (!p.measurements.includes('channel-power')) return;
    if (p.bandLow === undefined) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandLow'], message: 'is required for channel-power (Hz)' });
    if (p.bandHigh === undefined) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandHigh'], message: 'is required for channel-power (Hz)' });
    if (p.bandLow !== undefined && p.bandHigh !== undefined && !(p.bandHigh > p.bandLow)) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandHigh'], message: `must be above bandLow (${p.bandLow} Hz)` });
    }
  });

export type MeasureParams = z.infer<typeof measureSchema>;

const SPECTRAL: readonly Measurement[] = ['tone', 'snr', 'sinad', 'sfdr', 'channel-power', 'obw'];

function propagateIssues(params: MeasureParams, input: StreamFormat): ChainIssue[] {
  const issues: ChainIssue[] = [];
  if (params.measurements.includes('iq-imbalance') && input.sampleType !== 'complex') {
    issues.push({ severity: 'warning', code: 'measurement-needs-complex', field: 'measurements', message: 'iq-imbalance needs complex input; it is skipped for a real stream' });
  }
  if (params.measurements.includes('channel-power') && params.bandLow !== undefined && params.bandHigh !== undefined) {
    const nyquist = input.sampleRate / 2;
    const lowest = input.sampleType === 'complex' ? -nyquist : 0;
    if (params.bandLow < lowest || params.bandHigh > nyquist) {
      issues.push({
        severity: 'warning',
        code: 'band-outside-spectrum',
        field: params.bandHigh > nyquist ? 'bandHigh' : 'bandLow',
        message: `channel band ${params.bandLow} to ${params.bandHigh} Hz reaches beyond the spectrum (${lowest} to ${nyquist} Hz); only the part inside is measured`,
      });
    }
  }
  return issues;
}

/** The readouts asked for, from a finished spectrum and sample moments. */
function readoutsOf(params: MeasureParams, spectrum: MeasuredSpectrum | null, moments: SampleMoments, complex: boolean): Readout[] {
  const unit = params.calibrationDb !== 0 ? 'dBm' : 'dBFS';
  const cal = params.calibrationDb;
  const out: Readout[] = [];
  const wanted = new Set(params.measurements);
  if (spectrum) {
    // A readout that cannot be formed from this spectrum (e.g. no band bins) is left out rather than failing the run.
    const attempt = (fn: () => void) => {
      try {
        fn();
      } catch (error) {
        if (!(error instanceof RangeError)) throw error;
      }
    };
    if (wanted.has('tone')) {
      attempt(() => {
        const tone = findTone(spectrum);
        out.push({ name: 'Tone frequency', value: tone.frequency, unit: 'Hz' }, { name: 'Tone level', value: tone.levelDbfs + cal, unit });
      });
    }
    if (wanted.has('snr') || wanted.has('sinad') || wanted.has('sfdr')) {
      attempt(() => {
        const r = dynamicRange(spectrum, { harmonics: params.harmonics });
        if (wanted.has('snr')) out.push({ name: 'SNR', value: r.snrDb, unit: 'dB' });
        if (wanted.has('sinad')) out.push({ name: 'SINAD', value: r.sinadDb, unit: 'dB' });
        if (wanted.has('sfdr')) out.push({ name: 'SFDR', value: r.sfdrDb, unit: 'dBc' });
      });
    }
    if (wanted.has('channel-power') && params.bandLow !== undefined && params.bandHigh !== undefined) {
      const [low, high] = [params.bandLow, params.bandHigh];
      attempt(() => out.push({ name: 'Channel power', value: 10 * Math.log10(channelPower(spectrum, low, high)) + cal, unit }));
    }
    if (wanted.has('obw')) {
      attempt(() => {
        const obw = occupiedBandwidth(spectrum);
        out.push(
          { name: 'Occupied bandwidth (99 %)', value: obw.bandwidthHz, unit: 'Hz' },
          { name: 'Occupied band lower edge', value: obw.lowHz, unit: 'Hz' },
          { name: 'Occupied band upper edge', value: obw.highHz, unit: 'Hz' },
        );
      });
    }
  }
  if (moments.samples > 0 && wanted.has('dc')) {
    const { dcI, dcQ } = moments.means();
    if (complex) {
      out.push(
        { name: 'DC offset I', value: dcI, unit: 'FS' },
        { name: 'DC offset Q', value: dcQ, unit: 'FS' },
        { name: 'DC offset I level', value: dcLevelDbfs(dcI), unit: 'dBFS' },
        { name: 'DC offset Q level', value: dcLevelDbfs(dcQ), unit: 'dBFS' },
        { name: 'DC level', value: dcLevelDbfs(Math.hypot(dcI, dcQ)), unit: 'dBFS' },
      );
    } else {
      out.push({ name: 'DC offset', value: dcI, unit: 'FS' }, { name: 'DC level', value: dcLevelDbfs(dcI), unit: 'dBFS' });
    }
  }
  if (moments.samples > 0 && complex && wanted.has('iq-imbalance')) {
    const e = moments.imbalance();
    out.push(
      { name: 'I/Q gain imbalance', value: 20 * Math.log10(e.gainRatio), unit: 'dB' },
      { name: 'I/Q phase imbalance', value: (e.phaseRad * 180) / Math.PI, unit: 'deg' },
      { name: 'Image rejection', value: imageRejectionDb(e.gainRatio, e.phaseRad), unit: 'dB' },
    );
  }
  return out;
}

export const measureStage: StageDefinition<MeasureParams> = {
  kind: 'measure',
  title: 'Measure',
  summary: 'Readouts of the stream: tone, SNR, SINAD, SFDR, channel power, 99 % occupied bandwidth, DC offset and I/Q imbalance; the samples pass through unchanged.',
  schema: measureSchema,
  fields: {
    measurements: {
      label: 'Measurements',
      help: "Any of tone, snr, sinad, sfdr, channel-power (needs bandLow and bandHigh), obw (99 % occupied bandwidth), dc, iq-imbalance (complex only: gain, phase and the image rejection they imply).",
    },
    fftSize: fftSizeField,
    window: { ...windowField, help: 'Window of the measuring spectrum; blackman-harris keeps leakage below the noise of most captures.' },
    beta: betaField,
    bandLow: { label: 'Band low edge', unit: 'Hz', help: 'Channel power: lower band edge (negative frequencies allowed for complex streams).' },
    bandHigh: { label: 'Band high edge', unit: 'Hz', help: 'Channel power: upper band edge.' },
    harmonics: { label: 'Harmonics', help: 'Real streams: harmonics 2..N of the tone count as distortion (SINAD, not SNR).' },
    calibrationDb: calibrationField,
  },
  accepts: ['real', 'complex'],
  propagate(params, input) {
    return { output: { ...input }, issues: propagateIssues(params, input) };
  },
  create(params, input) {
    const complex = input.sampleType === 'complex';
    const needsSpectrum = params.measurements.some((m) => SPECTRAL.includes(m));
    const welch = needsSpectrum
      ? createMeasuringWelch({ sampleRate: input.sampleRate, sampleType: complex ? 'complex' : 'real', fftSize: params.fftSize, window: params.window, beta: params.beta })
      : null;
    const moments = new SampleMoments(complex);
    const empty = new Float32Array(0);
    let samples = 0;
    return {
      process(block) {
        welch?.push(block);
        moments.push(block);
        samples += block.length;
        return block;
      },
      finish() {
        welch?.finish();
        return empty;
      },
      probe() {
        const spectrum = welch && samples > 0 ? measuredSpectrum(welch, params.window, params.beta) : null;
        return { readouts: readoutsOf(params, spectrum, moments, complex) };
      },
    };
  },
};
