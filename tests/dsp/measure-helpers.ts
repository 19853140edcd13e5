/** Shared helpers of the measure-stage tests. */
import { expect } from 'vitest';
import { measureStage } from '@/dsp/stages/measure';
import type { Readout, StreamFormat } from '@/dsp/types';
import { randomBlocks } from './spectral-fixtures';

/** Runs the measure stage over `x` (cut into random blocks) and returns its readouts by name. */
export function measure(x: Float32Array, format: StreamFormat, params: Record<string, unknown>): Record<string, Readout> {
  const processor = measureStage.create(measureStage.schema.parse(params), format);
  const width = format.sampleType === 'complex' ? 2 : 1;
  for (const block of x.length > 0 ? randomBlocks(x, width, 7, 40_000) : []) processor.process(block);
  processor.finish();
  const readouts = processor.probe!().readouts!;
  // +/-Infinity and NaN never leave the engine; a null always says why.
  for (const r of readouts) {
    if (r.value === null) expect(r.reason, r.name).toMatch(/\w/);
    else expect(Number.isFinite(r.value), r.name).toBe(true);
  }
  return Object.fromEntries(readouts.map((r) => [r.name, r]));
}

/** The value of a readout that must have been computed (fails with its reason otherwise). */
export function valueOf(r: Readout | undefined): number {
  expect(r, 'readout present').toBeDefined();
  expect(r!.value, r!.reason).not.toBeNull();
  return r!.value!;
}
