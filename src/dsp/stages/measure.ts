/**
 * measure: readouts of the stream, passed through unchanged. Spectral readouts (tone, SFDR, channel
 * power, occupied bandwidth, measured image rejection) come from a mean Welch spectrum with
 * 'spectrum' scaling; SNR, SINAD, ENOB, THD and harmonics from a sine fit (IEEE Std 1241) of the
 * last `fitSamples` samples; DC offset and the blind I/Q imbalance estimate (Ellingson 2003) from
 * running sample moments. Memory is bounded by fftSize and fitSamples, not by the stream.
 */
import { z } from 'zod';
import { valuesPerSample, type ChainIssue, type StageDefinition, type StreamFormat } from '../types';
import { createMeasuringWelch, measuredSpectrum } from '../measure/measured-spectrum';
import { SampleMoments } from '../measure/sample-moments';
import { ClippingCounter } from '../measure/clipping';
import { measureReadouts } from './measure-readouts';
import { betaField, betaSchema, calibrationField, calibrationSchema, fftSizeField, fftSizeSchema, windowField, windowSchema } from './spectral-params';

export const MEASUREMENTS = [
  'tone',
  'snr',
  'sinad',
  'sfdr',
  'enob',
  'thd',
  'harmonics',
  'channel-power',
  'obw',
  'dc',
  'iq-imbalance',
  'image-rejection',
  'clipping',
  'noise-floor',
  'band-snr',
  'imd',
  'aclr',
  'evm',
] as const;
export type Measurement = (typeof MEASUREMENTS)[number];

/** Measurements that read a band: they need bandLow and bandHigh. */
const BANDED: readonly string[] = ['channel-power', 'band-snr', 'aclr'];

export const measureSchema = z
  .object({
    measurements: z.array(z.enum(MEASUREMENTS)).min(1).default(['tone', 'snr', 'sinad', 'sfdr', 'dc']),
    fftSize: fftSizeSchema(8192, 1 << 18),
    window: windowSchema.default('blackman-harris'),
    beta: betaSchema,
    bandLow: z.number().finite().optional(),
    bandHigh: z.number().finite().optional(),
    harmonics: z.number().int().min(1).max(20).default(5),
    fitSamples: z.number().int().min(16).max(4_194_304).default(65_536),
    aclrSpacing: z.number().finite().positive().optional(),
    imdGainDb: z.number().finite().min(-300).max(300).optional(),
    symbolRate: z.number().finite().positive().optional(),
    modulation: z.enum(['bpsk', 'qpsk', 'qam16']).default('qpsk'),
    rollOff: z.number().finite().min(0.05).max(1).default(0.35),
    calibrationDb: calibrationSchema,
  })
  .strict()
  .superRefine((p, ctx) => {
    if (p.measurements.includes('evm') && p.symbolRate === undefined) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['symbolRate'], message: 'is required for evm (symbols per second)' });
    }
    const banded = p.measurements.filter((m) => BANDED.includes(m));
    if (banded.length === 0) return;
    const needs = `is required for ${banded.join(', ')} (Hz)`;
    if (p.bandLow === undefined) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandLow'], message: needs });
    if (p.bandHigh === undefined) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandHigh'], message: needs });
    if (p.bandLow !== undefined && p.bandHigh !== undefined && !(p.bandHigh > p.bandLow)) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['bandHigh'], message: `must be above bandLow (${p.bandLow} Hz)` });
    }
  });

export type MeasureParams = z.infer<typeof measureSchema>;

// Every measurement reads the Welch spectrum but these three, which work on samples alone (the
// fit-based readouts need it too: it finds the tone the fit starts from).
const SAMPLES_ONLY: readonly Measurement[] = ['dc', 'clipping', 'evm'];
const SPECTRAL: readonly Measurement[] = MEASUREMENTS.filter((m) => !SAMPLES_ONLY.includes(m));
// These keep the last fitSamples samples: the sine fit and the EVM work on samples, not spectra.
const FITTED: readonly Measurement[] = ['snr', 'sinad', 'enob', 'thd', 'harmonics', 'evm'];

function propagateIssues(params: MeasureParams, input: StreamFormat): ChainIssue[] {
  const issues: ChainIssue[] = [];
  if (params.measurements.includes('evm') && input.sampleType !== 'complex') {
    issues.push({ severity: 'warning', code: 'measurement-needs-complex', field: 'measurements', message: 'evm needs a complex stream with the carrier at 0 Hz; it is not computed for a real stream' });
  }
  if (params.measurements.includes('iq-imbalance') && input.sampleType !== 'complex') {
    issues.push({ severity: 'warning', code: 'measurement-needs-complex', field: 'measurements', message: 'iq-imbalance needs complex input; it is skipped for a real stream' });
  }
  if (params.measurements.some((m) => BANDED.includes(m)) && params.bandLow !== undefined && params.bandHigh !== undefined) {
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

export const measureStage: StageDefinition<MeasureParams> = {
  kind: 'measure',
  title: 'Measure',
  summary:
    'Readouts of the stream: tone, SNR, SINAD, SFDR, ENOB, THD and harmonics, channel power, 99 % occupied bandwidth, DC offset, I/Q imbalance, image rejection and clipping; the samples pass through unchanged.',
  schema: measureSchema,
  fields: {
    measurements: {
      label: 'Measurements',
      help: "Any of: tone (strongest component: frequency and level); snr, sinad, enob, thd, harmonics (from a sine fit of the strongest tone, IEEE Std 1241: no window limits them; harmonics 2..N with their aliased frequencies, real streams); sfdr (carrier over the largest spur, both as main-lobe power, dBc and dBFS); channel-power (needs bandLow and bandHigh); obw (99 % occupied bandwidth, ITU-R SM.328, DC lobe left out); dc; iq-imbalance (complex only: gain of I relative to Q in dB, positive when I is stronger, phase, and the image rejection they imply); image-rejection (complex only: tone over its image at -f, read from the spectrum); clipping (samples at or beyond full scale per channel, and crest factor); noise-floor (mean noise of a bin away from DC, the tone and its harmonics, and the noise spectral density in dBFS/Hz: one-sided for real streams, two-sided for complex); band-snr (tone over the noise inside bandLow..bandHigh); imd (two strongest tones: third-order products at 2 f1 - f2 and 2 f2 - f1, IMD3 in dBc and the output intercept OIP3 = P + (P - P3) / 2; IIP3 when imdGainDb is set); aclr (channel bandLow..bandHigh over the same-width channels aclrSpacing below and above); evm (complex stream with a root-raised-cosine BPSK/QPSK/16-QAM carrier moved to 0 Hz: RMS EVM in % and dB and MER, after matched filtering, symbol timing from symbolRate, and fitting carrier frequency, phase and gain). A readout that cannot be computed shows no value and says why.",
    },
    fftSize: fftSizeField,
    window: {
      ...windowField,
      help: "Window of the measuring spectrum (tone, SFDR, noise floor, IMD, image rejection, bands). Its side lobes bound what those can show: blackman-harris (-92 dB) suits most captures; for a 14- to 16-bit ADC or a spur below -90 dBc use kaiser with beta 20 or more. A figure the window cannot resolve is withheld and says so. SNR, SINAD, ENOB, THD and harmonics come from a sine fit and do not depend on the window.",
    },
    beta: betaField,
    bandLow: { label: 'Band low edge', unit: 'Hz', help: 'Channel power, band SNR and ACLR: lower edge of the channel (negative frequencies allowed for complex streams).' },
    bandHigh: { label: 'Band high edge', unit: 'Hz', help: 'Channel power, band SNR and ACLR: upper edge of the channel.' },
    aclrSpacing: {
      label: 'Adjacent channel spacing',
      unit: 'Hz',
      help: 'ACLR: centre-to-centre distance from the channel to each adjacent channel of the same width; empty means the channel width (channels side by side).',
    },
    symbolRate: { label: 'Symbol rate', unit: 'Hz', help: 'EVM: symbols per second of the carrier (2 to 64 samples per symbol; decimate first otherwise).' },
    modulation: { label: 'Modulation', help: 'EVM: the reference constellation, bpsk, qpsk or qam16 (unit mean power).' },
    rollOff: { label: 'Roll-off', help: 'EVM: roll-off of the root-raised-cosine matched filter; use the transmitter\'s (0.35 for the demo beacon).' },
    imdGainDb: {
      label: 'Gain for IIP3',
      unit: 'dB',
      help: 'Two-tone IMD: the gain of the device under test from its input to this point; IIP3 = OIP3 - gain. Empty: IIP3 is not given.',
    },
    harmonics: {
      label: 'Harmonics',
      help: 'Real streams: harmonics 2..N of the tone count as distortion (in SINAD and THD, not in SNR); the harmonics table shows up to the 10th, at its aliased frequency.',
    },
    fitSamples: {
      label: 'Fit length',
      unit: 'samples',
      help: 'SNR, SINAD, ENOB, THD and harmonics fit a sine to the last this-many samples of the stream (after any filter has settled); longer is steadier and slower.',
    },
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
    const clipping = new ClippingCounter(complex);
    const width = valuesPerSample(input.sampleType);
    // A ring of the last fitSamples samples for the sine fit.
    const ring = params.measurements.some((m) => FITTED.includes(m)) ? new Float32Array(params.fitSamples * width) : null;
    let written = 0;
    const empty = new Float32Array(0);
    let samples = 0;
    return {
      process(block) {
        welch?.push(block);
        moments.push(block);
        clipping.push(block);
        if (ring) {
          const tail = block.length > ring.length ? block.subarray(block.length - ring.length) : block;
          const at = (written + block.length - tail.length) % ring.length;
          const first = Math.min(tail.length, ring.length - at);
          ring.set(tail.subarray(0, first), at);
          ring.set(tail.subarray(first), 0);
          written += block.length;
        }
        samples += block.length / width;
        return block;
      },
      finish() {
        welch?.finish();
        return empty;
      },
      probe() {
        const spectrum = welch && samples > 0 ? measuredSpectrum(welch, params.window, params.beta) : null;
        let fitSamples: Float32Array | null = null;
        if (ring && written > 0) {
          if (written <= ring.length) fitSamples = ring.slice(0, written);
          else {
            const at = written % ring.length;
            fitSamples = new Float32Array(ring.length);
            fitSamples.set(ring.subarray(at), 0);
            fitSamples.set(ring.subarray(0, at), ring.length - at);
          }
        }
        const readouts = measureReadouts({
          measurements: params.measurements,
          complex,
          sampleRate: input.sampleRate,
          fftSize: params.fftSize,
          window: params.window,
          harmonics: params.harmonics,
          calibrationDb: params.calibrationDb,
          bandLow: params.bandLow,
          bandHigh: params.bandHigh,
          aclrSpacing: params.aclrSpacing,
          imdGainDb: params.imdGainDb,
          evm: params.symbolRate !== undefined ? { symbolRate: params.symbolRate, modulation: params.modulation, rollOff: params.rollOff } : undefined,
          samples,
          spectrum,
          moments,
          clipping,
          fitSamples,
        });
        return { readouts };
      },
    };
  },
};
