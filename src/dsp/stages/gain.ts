/**
 * gain: a fixed gain in dB, or a gain that brings the RMS or peak level of the head of the stream
 * (the first `estimateSamples` samples, a head estimate) to a target in dBFS. Levels are relative to
 * full scale 1.0: RMS of a complex stream from |z|^2 (a full-scale complex tone reads 0 dBFS), of a
 * real stream from x^2 (a full-scale real sine reads -3.01 dBFS); peak is max |z| or max |x|.
 */
import { z } from 'zod';
import { valuesPerSample, type StageDefinition, type SampleType } from '../types';
import { BlockBuffer } from './block-buffer';
import { createHeadEstimatingProcessor } from './head-estimate';
import { amplitudeFromDb, dbFromAmplitude } from './levels';

/** Parameters of gain: mode, gainDb [dB] (fixed), targetDb [dBFS] and estimateSamples [samples] (rms, peak). */
export const gainSchema = z
  .object({
    mode: z.enum(['fixed', 'rms', 'peak']).default('fixed'),
    gainDb: z.number().finite().min(-200).max(200).default(0),
    targetDb: z.number().finite().min(-200).max(40).default(-20),
    estimateSamples: z.number().int().min(1).max(4_194_304).default(262_144),
  })
  .strict();

export type GainParams = z.infer<typeof gainSchema>;

export const gainStage: StageDefinition<GainParams> = {
  kind: 'gain',
  title: 'Gain',
  summary: 'Scales the stream by a fixed gain in dB, or normalises its RMS or peak level (measured on the head) to a target in dBFS.',
  schema: gainSchema,
  fields: {
    mode: { label: 'Mode', help: "'fixed': apply gainDb. 'rms' / 'peak': measure the RMS or peak level of the first estimateSamples samples and scale it to targetDb." },
    gainDb: { label: 'Gain', unit: 'dB', help: "Fixed mode: amplitude gain, 20 log10." },
    targetDb: {
      label: 'Target level',
      unit: 'dBFS',
      help: 'RMS or peak mode: level to reach, relative to full scale 1.0 (a full-scale complex tone is 0 dBFS RMS, a full-scale real sine -3.01 dBFS RMS).',
    },
    estimateSamples: { label: 'Estimate length', unit: 'samples', help: 'RMS or peak mode: samples at the start of the stream that are measured (head estimate; output is held back until they arrive).' },
  },
  accepts: ['real', 'complex', 'real-pair'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params, input) {
    if (params.mode === 'fixed') {
      const factor = amplitudeFromDb(params.gainDb);
      const out = new BlockBuffer();
      return {
        process(block) {
          const y = out.take(block.length);
          for (let v = 0; v < block.length; v++) y[v] = block[v] * factor;
          return y;
        },
        finish() {
          return out.take(0);
        },
      };
    }
    const measure = params.mode === 'rms' ? rmsLevel : peakLevel;
    return createHeadEstimatingProcessor(valuesPerSample(input.sampleType), params.estimateSamples, (head) => {
      const level = measure(head, input.sampleType);
      // A silent head gives no level to normalise: pass the stream through unchanged.
      const factor = level > 0 ? amplitudeFromDb(params.targetDb - dbFromAmplitude(level)) : 1;
      return (x, y) => {
        for (let v = 0; v < x.length; v++) y[v] = x[v] * factor;
      };
    });
  },
};

/** RMS amplitude (full scale 1.0): sqrt(mean |z|^2) for complex, sqrt(mean x^2) per value otherwise. */
export function rmsLevel(block: Float32Array, type: SampleType): number {
  let sum = 0;
  for (let v = 0; v < block.length; v++) sum += block[v] * block[v];
  const count = type === 'complex' ? block.length / 2 : block.length;
  return count > 0 ? Math.sqrt(sum / count) : 0;
}

/** Peak amplitude (full scale 1.0): max |z| for complex, max |x| otherwise. */
export function peakLevel(block: Float32Array, type: SampleType): number {
  let peak = 0;
  if (type === 'complex') {
    for (let v = 0; v < block.length; v += 2) peak = Math.max(peak, block[v] * block[v] + block[v + 1] * block[v + 1]);
    return Math.sqrt(peak);
  }
  for (let v = 0; v < block.length; v++) peak = Math.max(peak, Math.abs(block[v]));
  return peak;
}
