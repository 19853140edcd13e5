/**
 * The synthesizer form as a zod schema: every field has a unit, a default and limits, so the form
 * can be generated from it and `synthSpecSchema.parse({})` gives a usable capture (a -6 dBFS tone
 * over noise).
 *
 * Level conventions (one rule for every component and layout):
 * - A component's level L in dBFS is the mean power of its complex envelope s(t):
 *   <|s|^2> = 10^(L/10). A complex tone of amplitude A is 20 log10 A dBFS, so a full-scale complex
 *   tone is 0 dBFS; a modulated carrier's level is its mean (RMS) power.
 * - A complex or real-pair capture holds s(t) e^{j 2 pi f t} (I = real part, Q = imaginary part).
 * - A real capture holds Re{s(t) e^{j 2 pi f t}}: a real tone of level L has peak amplitude
 *   10^(L/20), so a full-scale sine is 0 dBFS (the usual ADC convention), and its mean power is half
 *   that of a complex tone of the same level.
 * - Noise `level` is the total noise power over the sampled band (fs for complex and real-pair,
 *   fs/2 for real) on the same scale: each value (I, Q, or the real sample) gets variance
 *   10^(L/10) / 2. So SNR = carrier level - noise level in every layout.
 */
import { z } from 'zod';

/** Largest capture the synthesizer makes: 2^34 samples (128 GiB of cf32), far above any quota. */
export const MAX_SYNTH_SAMPLES = 2 ** 34;

const hz = (what: string) => z.number({ invalid_type_error: `${what} must be a number in Hz` }).finite();
const dbfs = () => z.number().finite().min(-200, 'must be >= -200 dBFS').max(20, 'must be <= +20 dBFS');

/** A continuous-wave tone. */
export const synthToneSchema = z.object({
  /** Hz from the centre (complex, real-pair) or from 0 Hz (real). */
  frequency: hz('frequency').default(100_000),
  /** dBFS, see the level conventions above. */
  level: dbfs().default(-6),
  /** Start phase in degrees. */
  phase: z.number().finite().min(-360).max(360).default(0),
});

const carrierBase = {
  /** Carrier frequency in Hz: offset from the centre (complex, real-pair) or IF frequency (real). */
  frequency: hz('frequency').default(250_000),
  /** Mean power of the carrier in dBFS (AM: the unmodulated carrier's level). */
  level: dbfs().default(-10),
};

/** BPSK, QPSK or 16-QAM with root-raised-cosine shaping and random symbols from the seed. */
export const synthDigitalCarrierSchema = z.object({
  modulation: z.enum(['bpsk', 'qpsk', 'qam16']),
  ...carrierBase,
  /** Symbols per second (Hz). */
  symbolRate: z.number().finite().gt(0, 'must be > 0 Hz').default(100_000),
  /** Root-raised-cosine roll-off factor (excess bandwidth), 0.05 to 1. */
  rollOff: z.number().finite().min(0.05, 'must be >= 0.05').max(1, 'must be <= 1').default(0.35),
  /** Pulse length in symbol periods (truncation of the root-raised-cosine pulse). */
  span: z.number().int('must be a whole number of symbols').min(2, 'must be >= 2 symbols').max(64, 'must be <= 64 symbols').default(12),
});

/** AM by a tone: s(t) = A (1 + depth cos(2 pi toneFrequency t)). */
export const synthAmCarrierSchema = z.object({
  modulation: z.literal('am'),
  ...carrierBase,
  /** Modulation depth, 0 to 1 (1 = 100 %). */
  depth: z.number().finite().min(0, 'must be >= 0').max(1, 'must be <= 1 (no over-modulation)').default(0.5),
  /** Modulating tone in Hz. */
  toneFrequency: z.number().finite().gt(0, 'must be > 0 Hz').default(1_000),
});

/** FM by a tone: s(t) = A exp(j (deviation / toneFrequency) sin(2 pi toneFrequency t)). */
export const synthFmCarrierSchema = z.object({
  modulation: z.literal('fm'),
  ...carrierBase,
  /** Peak frequency deviation in Hz. */
  deviation: z.number().finite().min(0, 'must be >= 0 Hz').default(5_000),
  /** Modulating tone in Hz. */
  toneFrequency: z.number().finite().gt(0, 'must be > 0 Hz').default(1_000),
});

export const synthCarrierSchema = z.discriminatedUnion('modulation', [synthDigitalCarrierSchema, synthAmCarrierSchema, synthFmCarrierSchema]);

/** Noise: none, a total power, or an SNR against the strongest tone or carrier. */
export const synthNoiseSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('off') }),
  z.object({
    mode: z.literal('total'),
    /** Total noise power over the sampled band in dBFS. */
    level: dbfs().default(-60),
  }),
  z.object({
    mode: z.literal('snr'),
    /** Strongest component's level minus the total noise level, in dB over the sampled band. */
    snr: z.number().finite().min(-50, 'must be >= -50 dB').max(200, 'must be <= 200 dB').default(40),
  }),
]);

/** Front-end and converter impairments, applied in this order: frequency offset, I/Q imbalance, DC, ADC. */
export const synthImpairmentsSchema = z.object({
  /** I channel gain over Q channel gain in dB (split half on each channel). */
  gainImbalance: z.number().finite().min(-6, 'must be >= -6 dB').max(6, 'must be <= 6 dB').default(0),
  /** Phase error of the Q channel in degrees: Q' = Q cos p + I sin p. */
  phaseImbalance: z.number().finite().min(-45, 'must be >= -45 deg').max(45, 'must be <= 45 deg').default(0),
  /** DC offset added to I (or to the real channel), as a fraction of full scale. */
  dcOffsetI: z.number().finite().min(-1, 'must be >= -1 (fraction of full scale)').max(1, 'must be <= 1 (fraction of full scale)').default(0),
  /** DC offset added to Q, as a fraction of full scale. */
  dcOffsetQ: z.number().finite().min(-1, 'must be >= -1 (fraction of full scale)').max(1, 'must be <= 1 (fraction of full scale)').default(0),
  /** Added to every tone and carrier frequency, in Hz (LO error). */
  frequencyOffset: hz('frequencyOffset').default(0),
  /** ADC resolution in bits, 2 to 24; 0 = no quantisation. */
  adcBits: z
    .number()
    .int('must be a whole number of bits')
    .min(0, 'must be 0 (off) or 2 to 24 bits')
    .max(24, 'must be <= 24 bits')
    .refine((b) => b !== 1, 'must be 0 (off) or 2 to 24 bits')
    .default(0),
  /** Saturate at full scale (-1 to +1, or the largest ADC code). */
  clip: z.boolean().default(true),
});

export const synthLayoutSchema = z.enum(['complex', 'real', 'real-pair']);

const synthSpecObject = z.object({
  /** Optional label carried into the capture's metadata. */
  name: z.string().max(200, 'must be at most 200 characters').optional(),
  /** Samples per second (Hz). */
  sampleRate: z.number().finite().gt(0, 'must be > 0 Hz').max(100e9, 'must be <= 100 GHz').default(1_000_000),
  /** Length of the capture in seconds; sample count = round(duration * sampleRate). */
  duration: z.number().finite().gt(0, 'must be > 0 s').default(0.1),
  /** SigMF datatype of the stored bytes: c... for complex, r... for real and real-pair. */
  datatype: z.string().trim().min(1, 'must name a SigMF datatype such as cf32_le').default('cf32_le'),
  layout: synthLayoutSchema.default('complex'),
  /** RF frequency (Hz) that 0 Hz of the capture stands for; metadata only. */
  centerFrequency: hz('centerFrequency').default(0),
  tones: z.array(synthToneSchema).max(64, 'at most 64 tones').default([{ frequency: 100_000, level: -6, phase: 0 }]),
  carriers: z.array(synthCarrierSchema).max(16, 'at most 16 carriers').default([]),
  noise: synthNoiseSchema.default({ mode: 'total', level: -60 }),
  impairments: synthImpairmentsSchema.default({}),
  /** Seed of every random choice (noise, symbols): the same spec and seed give the same bytes. */
  seed: z.number().int('must be an integer').min(0, 'must be >= 0').max(4294967295, 'must be <= 4294967295').default(1),
});

export type SynthTone = z.output<typeof synthToneSchema>;
export type SynthCarrier = z.output<typeof synthCarrierSchema>;
export type SynthDigitalCarrier = z.output<typeof synthDigitalCarrierSchema>;
export type SynthNoise = z.output<typeof synthNoiseSchema>;
export type SynthImpairments = z.output<typeof synthImpairmentsSchema>;
export type SynthLayout = z.output<typeof synthLayoutSchema>;

/** Sample count of a spec: round(duration * sampleRate). */
export function synthSampleCount(spec: { duration: number; sampleRate: number }): number {
  return Math.round(spec.duration * spec.sampleRate);
}

export { synthSpecObject };
