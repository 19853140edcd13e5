/**
 * spectrum: a Welch power spectral density of the stream, passed through unchanged. Real input
 * gives a one-sided spectrum (0 to fs/2), complex input a two-sided one with 0 Hz centred. Levels
 * are dBFS/Hz (density) or dBFS (spectrum scaling), dBm[/Hz] with a calibration offset.
 */
import { z } from 'zod';
import type { StageDefinition } from '../types';
import { WelchAccumulator } from '../spectral/welch';
import { levelFields, levelSchemaFields, segmentFields, segmentOptions, segmentSchemaFields } from './spectral-params';

export const spectrumSchema = z
  .object({
    ...segmentSchemaFields(4096, 1 << 18),
    averaging: z.enum(['mean', 'max']).default('mean'),
    ...levelSchemaFields,
  })
  .strict();

export type SpectrumParams = z.infer<typeof spectrumSchema>;

export const spectrumStage: StageDefinition<SpectrumParams> = {
  kind: 'spectrum',
  title: 'Spectrum',
  summary: 'Welch power spectrum of the stream (dBFS/Hz or dBFS, optionally calibrated to dBm); the samples pass through unchanged.',
  schema: spectrumSchema,
  fields: {
    ...segmentFields,
    averaging: { label: 'Averaging', help: "'mean': Welch average of the segment powers. 'max': highest power per bin over all segments (max hold)." },
    ...levelFields,
  },
  accepts: ['real', 'complex'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params, input) {
    const welch = new WelchAccumulator({ ...segmentOptions(params, input), averaging: params.averaging });
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
