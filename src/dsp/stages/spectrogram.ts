/**
 * spectrogram: short-time power spectra of the stream as an image of at most maxRows time rows
 * (neighbouring rows merged by averaging power as the stream grows) and fftSize frequency columns;
 * the samples pass through unchanged.
 */
import { z } from 'zod';
import type { StageDefinition } from '../types';
import { SpectrogramAccumulator } from '../spectral/spectrogram';
import { levelFields, levelSchemaFields, segmentFields, segmentOptions, segmentSchemaFields } from './spectral-params';

export const spectrogramSchema = z
  .object({
    // Columns = fftSize: 8192 x 1024 rows bounds the image at about 8 million levels.
    ...segmentSchemaFields(1024, 8192),
    maxRows: z.number().int().min(2).max(1024).default(256),
    ...levelSchemaFields,
  })
  .strict();

export type SpectrogramParams = z.infer<typeof spectrogramSchema>;

export const spectrogramStage: StageDefinition<SpectrogramParams> = {
  kind: 'spectrogram',
  title: 'Spectrogram',
  summary: 'Power spectrum over time as a bounded image (rows merged as the stream grows); the samples pass through unchanged.',
  schema: spectrogramSchema,
  fields: {
    ...segmentFields,
    maxRows: {
      label: 'Time rows',
      help: 'Most rows in the image. When the rows fill up, neighbouring rows are averaged in pairs and each row then covers twice as many segments.',
    },
    ...levelFields,
  },
  accepts: ['real', 'complex'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params, input) {
    const image = new SpectrogramAccumulator({ ...segmentOptions(params, input), maxRows: params.maxRows });
    const empty = new Float32Array(0);
    return {
      process(block) {
        image.push(block);
        return block;
      },
      finish() {
        return empty;
      },
      probe() {
        return image.segments > 0 ? { spectrogram: image.result(params.calibrationDb) } : {};
      },
    };
  },
};
