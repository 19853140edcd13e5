/**
 * dc-remove: removes a DC offset, either by subtracting the mean measured on the head of the stream
 * (the first `estimateSamples` samples, a head estimate: a DC that drifts later is not followed) or
 * with a one-pole DC blocker y[n] = x[n] - x[n-1] + pole * y[n-1] (common practice), whose notch at
 * 0 Hz is about (1 - pole) * fs / pi Hz wide at -3 dB. The blocker starts from the mean of its
 * first 1 / (1 - pole) samples (held back until they arrive), so it leaves no start-up step.
 */
import { z } from 'zod';
import { valuesPerSample, type StageDefinition, type StageProcessor } from '../types';
import { createHeadEstimatingProcessor } from './head-estimate';

/** Parameters of dc-remove: method, blocker pole (0.9..0.999999), estimateSamples [samples]. */
export const dcRemoveSchema = z
  .object({
    method: z.enum(['mean', 'blocker']).default('mean'),
    pole: z.number().finite().min(0.9).max(0.999999).default(0.999),
    estimateSamples: z.number().int().min(1).max(4_194_304).default(262_144),
  })
  .strict();

export type DcRemoveParams = z.infer<typeof dcRemoveSchema>;

export const dcRemoveStage: StageDefinition<DcRemoveParams> = {
  kind: 'dc-remove',
  title: 'DC removal',
  summary: 'Removes a DC offset: subtract the mean of the head of the stream, or a one-pole DC blocker.',
  schema: dcRemoveSchema,
  fields: {
    method: {
      label: 'Method',
      help: "'mean': subtract the mean of the first estimateSamples samples (head estimate; output is held back until they arrive). 'blocker': one-pole high-pass y[n] = x[n] - x[n-1] + pole y[n-1], follows a drifting DC; it starts from the mean of its first 1 / (1 - pole) samples (held back until they arrive), so a large first sample leaves no decaying step.",
    },
    pole: { label: 'Blocker pole', help: 'Closer to 1 gives a narrower notch at 0 Hz (about (1 - pole) fs / pi Hz at -3 dB) and a slower settling.' },
    estimateSamples: { label: 'Estimate length', unit: 'samples', help: "Samples at the start of the stream whose mean is removed ('mean' method)." },
  },
  accepts: ['real', 'complex', 'real-pair'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params, input) {
    const channels = valuesPerSample(input.sampleType);
    return params.method === 'mean' ? meanRemover(channels, params.estimateSamples) : dcBlocker(channels, params.pole);
  },
};

function meanRemover(channels: number, estimateSamples: number): StageProcessor {
  return createHeadEstimatingProcessor(channels, estimateSamples, (head) => {
    const samples = head.length / channels;
    const means = new Float64Array(channels);
    for (let v = 0; v < head.length; v++) means[v % channels] += head[v];
    for (let c = 0; c < channels; c++) means[c] /= samples;
    return (x, y) => {
      for (let v = 0; v < x.length; v++) y[v] = x[v] - means[v % channels];
    };
  });
}

/** Longest head (samples) whose mean primes the blocker: memory stays small for poles near 1. */
const MAX_PRIMING_SAMPLES = 65_536;

function dcBlocker(channels: number, pole: number): StageProcessor {
  // Primed from the mean of a short head (one time constant, 1 / (1 - pole) samples), as if the
  // stream had sat at its DC level before it began: starting from the first sample instead would
  // leave that sample's distance from the DC (a tone's peak, a spike) as a slowly decaying step.
  const head = Math.min(MAX_PRIMING_SAMPLES, Math.ceil(1 / (1 - pole)));
  return createHeadEstimatingProcessor(channels, head, (held) => {
    const samples = held.length / channels;
    // Per channel: previous input and previous output, in float64 so the recursion does not drift.
    const previousIn = new Float64Array(channels);
    const previousOut = new Float64Array(channels);
    for (let v = 0; v < held.length; v++) previousIn[v % channels] += held[v];
    for (let c = 0; c < channels; c++) previousIn[c] /= samples;
    return (x, y) => {
      for (let c = 0; c < channels; c++) {
        let xPrev = previousIn[c];
        let yPrev = previousOut[c];
        for (let v = c; v < x.length; v += channels) {
          const value = x[v];
          yPrev = value - xPrev + pole * yPrev;
          xPrev = value;
          y[v] = yPrev;
        }
        previousIn[c] = xPrev;
        previousOut[c] = yPrev;
      }
    };
  });
}
