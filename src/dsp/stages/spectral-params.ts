/** Parameter pieces shared by the spectrum, spectrogram and measure stages. */
import { z } from 'zod';
import { WINDOW_NAMES, DEFAULT_KAISER_BETA } from '../windows/window-function';
import type { FieldInfo } from '../types';

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
export const betaField: FieldInfo = { label: 'Kaiser beta', help: 'Kaiser window only: larger beta gives lower side lobes and a wider main lobe (8.6: about -69 dB).' };
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
