/**
 * Every stream stage must give the same samples whether a capture arrives in one block or in blocks
 * of random sizes (including empty blocks and blocks that split the head estimate or the NCO chunk).
 */
import { describe, expect, it } from 'vitest';
import { valuesPerSample, type StageDefinition, type StreamFormat } from '@/dsp/types';
import { dcRemoveStage, gainStage, iqCorrectStage, mixStage, quadratureCombineStage, quadratureMixStage, trimStage } from '@/dsp/stages/index';
import { gaussianNoise, randomBlocks, runStage, sameBits } from './stages-helpers';

const SAMPLES = 6000;

function capture(format: StreamFormat, seed: number): Float32Array {
  const values = SAMPLES * valuesPerSample(format.sampleType);
  const data = gaussianNoise(values, 0.2, seed);
  // A DC offset and an imbalance give the estimating stages something to find.
  for (let v = 0; v < values; v += 2) data[v] = data[v] * 1.05 + 0.03;
  return data;
}

const complex: StreamFormat = { sampleRate: 1e6, sampleType: 'complex' };
const real: StreamFormat = { sampleRate: 1e6, sampleType: 'real' };
const pair: StreamFormat = { sampleRate: 1e6, sampleType: 'real-pair' };

const cases: [string, StageDefinition<any>, unknown, StreamFormat][] = [
  ['quadrature-combine i+jQ', quadratureCombineStage, {}, pair],
  ['quadrature-combine I-jQ swapped', quadratureCombineStage, { convention: 'i-minus-jq', swap: true }, pair],
  ['quadrature-mix I-jQ', quadratureMixStage, { loFrequency: 123_456, phase: 30 }, real],
  ['quadrature-mix I+jQ, non-integer LO', quadratureMixStage, { loFrequency: 98_765.4321, convention: 'i-plus-jq' }, real],
  ['mix integer frequency', mixStage, { frequency: -250_000, phase: 10 }, complex],
  ['mix non-integer frequency', mixStage, { frequency: 1234.56789 }, { ...complex, sampleRate: 1e6 / 3 }],
  ['dc-remove mean, head shorter than capture', dcRemoveStage, { method: 'mean', estimateSamples: 1500 }, complex],
  ['dc-remove mean, head longer than capture', dcRemoveStage, { method: 'mean', estimateSamples: 100_000 }, real],
  ['dc-remove blocker on two channels', dcRemoveStage, { method: 'blocker', pole: 0.99 }, pair],
  ['iq-correct blind', iqCorrectStage, { mode: 'blind', estimateSamples: 2000 }, complex],
  ['iq-correct manual', iqCorrectStage, { mode: 'manual', gainDb: 0.4, phaseDeg: -2 }, complex],
  ['gain fixed', gainStage, { mode: 'fixed', gainDb: -3 }, real],
  ['gain rms', gainStage, { mode: 'rms', targetDb: -6, estimateSamples: 999 }, complex],
  ['gain peak', gainStage, { mode: 'peak', targetDb: -1, estimateSamples: 4096 }, pair],
  ['trim window', trimStage, { start: 0.000777, duration: 0.003 }, complex],
  ['trim to the end', trimStage, { start: 0.0021 }, real],
];

describe('block-size invariance of the stream stages', () => {
  it.each(cases)('%s: random blocks give the same samples as one block', (_name, definition, params, format) => {
    const data = capture(format, 7);
    const channels = valuesPerSample(format.sampleType);
    const whole = runStage(definition, params, format, [data]);
    expect(whole.length).toBeGreaterThan(0);
    for (const [maxSamples, seed] of [
      [1, 1],
      [37, 2],
      [1500, 3],
    ]) {
      const split = runStage(definition, params, format, randomBlocks(data, channels, maxSamples, seed));
      expect(sameBits(split, whole), `max block ${maxSamples} samples`).toBe(true);
    }
  });
});
