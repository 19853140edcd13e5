/** Parameter pieces shared by the spectrum, spectrogram and measure stages. */
import { z } from 'zod';
import { WINDOW_NAMES, DEFAULT_KAISER_BETA, type WindowName } from '../windows/window-function';
import type { FieldInfo, StreamFormat } from '../types';

/** FFT size (samples) of an analysis stage: a power of two from 16 to `max`. */
export function fftSizeSchema(defaultSize: number, max: number) {
  return z
    .number()
    .int()
    .min(16)
    .max(max)
    .refine((n) => (n & (n - 1)) === 0, { message: 'must be a power of two (16, 32, ..., ' + max + ')' })
    .default(defaultSize);
}

export const windowSchema = z.enum(WINDOW_NAMES);
export const betaSchema = z.number().finite().min(0).max(50).default(DEFAULT_KAISER_BETA);
export const overlapSchema = z.number().finite().min(0).max(0.95).default(0.5);
export const scalingSchema = z.enum(['density', 'spectrum']).default('density');
export const calibrationSchema = z.number().finite().min(-300).max(300).default(0);

export const windowField: FieldInfo = {
  label: 'Window',
  help: 'Periodic window applied to each segment: hann (general use), blackman-harris (-92 dB side lobes, for spurs), flattop (accurate tone levels), kaiser (shape set by beta).',
};
export const betaField: FieldInfo = {
  label: 'Kaiser beta',
  help: 'Kaiser window only: larger beta gives lower side lobes and a wider main lobe. Highest side lobe measured on the window itself: beta 5: -37 dB, 8.6: -63 dB, 12: -90 dB, 20: -155 dB, 30: -238 dB.',
};
export const fftSizeField: FieldInfo = { label: 'FFT size', unit: 'samples', help: 'Segment length; the bin spacing is sample rate / FFT size.' };
export const overlapField: FieldInfo = { label: 'Overlap', help: 'Fraction of each segment shared with the next, 0 to 0.95 (0.5 is usual for Hann).' };
export const scalingField: FieldInfo = {
  label: 'Scaling',
  help: "'density': power per Hz (dBFS/Hz), for noise and channel power. 'spectrum': power per bin (dBFS), a tone on a bin centre reads its power.",
};
export const calibrationField: FieldInfo = {
  label: 'Calibration',
  unit: 'dB',
  help: 'Added to every level; a non-zero value turns dBFS into dBm (the dBm reading of a 0 dBFS signal).',
};

/**
 * Schema fields of a segment analysis stage (spectrum, spectrogram) that come before its own:
 * window, beta, fftSize (samples, power of two up to `maxFftSize`) and overlap. Spread first into
 * the object so the keys keep their order in forms and saved chains.
 */
export function segmentSchemaFields(defaultFftSize: number, maxFftSize: number) {
  return {
    window: windowSchema.default('hann'),
    beta: betaSchema,
    fftSize: fftSizeSchema(defaultFftSize, maxFftSize),
    overlap: overlapSchema,
  };
}

/** Schema fields that end a segment analysis stage: level scaling and calibration (dB). */
export const levelSchemaFields = { scaling: scalingSchema, calibrationDb: calibrationSchema };

/** Form fields matching `segmentSchemaFields`. */
export const segmentFields = { window: windowField, beta: betaField, fftSize: fftSizeField, overlap: overlapField };

/** Form fields matching `levelSchemaFields`. */
export const levelFields = { scaling: scalingField, calibrationDb: calibrationField };

/** What a segment analysis stage's parameters carry, whatever its own extra fields. */
export interface SegmentParams {
  window: WindowName;
  beta: number;
  /** Segment length (samples). */
  fftSize: number;
  overlap: number;
  scaling: 'density' | 'spectrum';
}

/** Accumulator options (sample rate in Hz, sample type, segment settings) for a stage's input stream. */
export function segmentOptions(params: SegmentParams, input: StreamFormat) {
  return {
    sampleRate: input.sampleRate,
    sampleType: input.sampleType === 'complex' ? ('complex' as const) : ('real' as const),
    fftSize: params.fftSize,
    window: params.window,
    beta: params.beta,
    overlap: params.overlap,
    scaling: params.scaling,
  };
}
