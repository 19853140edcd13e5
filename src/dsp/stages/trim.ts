/**
 * trim: keeps the time window [start, start + duration) of the stream, in seconds from its first
 * sample; duration 0 keeps everything from start to the end. Sample indices are start * fs and
 * duration * fs rounded to the nearest sample.
 */
import { z } from 'zod';
import { valuesPerSample, type ChainIssue, type StageDefinition } from '../types';
import { EMPTY_BLOCK } from './block-buffer';

/** Parameters of trim: start [s] and duration [s] (0 = to the end). */
export const trimSchema = z
  .object({
    start: z.number().finite().min(0).max(1e7).default(0),
    duration: z.number().finite().min(0).max(1e7).default(0),
  })
  .strict();

export type TrimParams = z.infer<typeof trimSchema>;

/** First kept sample and number of kept samples (Infinity: to the end) for a stream at `sampleRate` Hz. */
export function trimWindow(params: TrimParams, sampleRate: number): { first: number; count: number } {
  const first = Math.round(params.start * sampleRate);
  const count = params.duration > 0 ? Math.max(1, Math.round(params.duration * sampleRate)) : Infinity;
  return { first, count };
}

export const trimStage: StageDefinition<TrimParams> = {
  kind: 'trim',
  title: 'Trim',
  summary: 'Keeps a time window of the stream: start and duration in seconds (duration 0 = to the end).',
  schema: trimSchema,
  fields: {
    start: { label: 'Start', unit: 's', help: 'Time of the first kept sample, from the start of the stream.' },
    duration: { label: 'Duration', unit: 's', help: 'Length of the kept window; 0 keeps everything after start.' },
  },
  accepts: ['real', 'complex', 'real-pair'],
  propagate(params, input) {
    const issues: ChainIssue[] = [];
    if (params.duration > 0 && params.duration * input.sampleRate < 0.5) {
      issues.push({
        severity: 'warning',
        code: 'duration-below-one-sample',
        field: 'duration',
        message: `${params.duration} s is shorter than one sample at ${input.sampleRate} Hz: one sample is kept`,
      });
    }
    return { output: { ...input }, issues };
  },
  create(params, input) {
    const channels = valuesPerSample(input.sampleType);
    const { first, count } = trimWindow(params, input.sampleRate);
    const last = first + count; // exclusive; Infinity keeps to the end
    let position = 0; // index of the first sample of the next block
    return {
      process(block) {
        const samples = block.length / channels;
        const from = Math.max(first, position);
        const to = Math.min(last, position + samples);
        const blockStart = position;
        position += samples;
        if (to <= from) return EMPTY_BLOCK;
        // A view of the input: valid as long as the input, which the runner hands on at once.
        return block.subarray((from - blockStart) * channels, (to - blockStart) * channels);
      },
      finish() {
        return EMPTY_BLOCK;
      },
    };
  },
};
