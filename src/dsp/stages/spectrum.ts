/**
 * spectrum: a Welch power spectral density of the stream, passed through unchanged. Real input
 * gives a one-sided spectrum (0 to fs/2), complex input a two-sided one with 0 Hz centred. Levels
 * are dBFS/Hz (density) or dBFS (spectrum scaling), dBm[/Hz] with a calibration offset.
 */
import { z } from 'zod';
import type { StageDefinition } from '../types';
import { WelchAccumulator } from '../spectral/welch';
import {
  betaField,
  betaSchema,
  calibrationField,
  calibrationSchema,
  fftSizeField,
  fftSizeSchema,
  overlapField,
  overlapSchema,
  scalingField,
  scalingSchema,
  windowField,
  windowSchema,
} from './spectral-params';

export const spectrumSchema = z
  .object({
    window: windowSchema.default('hann'),
    beta: betaSchema,
    fftSize: fftSizeSchema(4096, 1 << 18),
    overlap: overlapSchema,
    averaging: z.enum(['mean', 'max']).default('mean'),
    scaling: scalingSchema,
    calibrationDb: calibrationSchema,
  })
  .strict();

export type SpectrumParams = z.infer<typeof spectrumSchema>;

export const spectrumStage: StageDefinition<SpectrumParams> = {
  kind: 'spectrum',
  title: 'Spectrum',
  summary: 'Welch power spectrum of the stream (dBFS/Hz or dBFS, optionally calibrated to dBm); the samples pass through unchanged.',
  schema: spectrumSchema,
  fields: {
    window: windowField,
    beta: betaField,
    fftSize: fftSizeField,
    overlap: overlapField,
    averaging: { label: 'Averaging', help: "'mean': Welch average of the segment powers. 'max': highest power per bin over all segments (max hold)." },
    scaling: scalingField,
    calibrationDb: calibrationField,
  },
  accepts: ['real', 'complex'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params, input) {
    const welch = new WelchAccumulator({
      sampleRate: input.sampleRate,
      sampleType: input.sampleType === 'complex' ? 'complex' : 'real',
      fftSize: params.fftSize,
      window: params.window,
      beta: params.beta,
      overlap: params.overlap,
      averaging: params.averaging,
      scaling: params.scaling,
    });
    let samples = 0;
    const empty = new Float32Array(0);
    return {
      process(block) {
        welch.push(block);
        samples += block.length;
        return block;
      },
      finish() {
        welch.finish();
        return empty;
      },
      probe() {
        return samples > 0 ? { spectrum: welch.result(params.calibrationDb) } : {};
      },
    };
  },
};
