/**
 * Streaming skeleton for stages that estimate something on the head of a stream and then apply it
 * to every sample, head included (mean DC removal, blind I/Q correction, RMS or peak gain). The head
 * is held back until `estimateSamples` samples have arrived (or the stream ends), so the output
 * does not depend on block sizes. Memory: estimateSamples x values per sample float32 values.
 */
import type { StageProcessor } from '../types';
import { BlockBuffer, EMPTY_BLOCK } from './block-buffer';

/** Estimate on the held head (interleaved values), then return the function that corrects blocks. */
export type HeadEstimator = (head: Float32Array) => (input: Float32Array, output: Float32Array) => void;

/** A processor that holds `estimateSamples` samples, estimates on them and corrects the whole stream. */
export function createHeadEstimatingProcessor(
  valuesPerSample: number,
  estimateSamples: number,
  estimate: HeadEstimator,
): StageProcessor {
  const capacity = estimateSamples * valuesPerSample;
  let head: Float32Array | null = new Float32Array(capacity);
  let filled = 0;
  let correct: ((input: Float32Array, output: Float32Array) => void) | null = null;
  const out = new BlockBuffer();

  function releaseHead(tail: Float32Array): Float32Array {
    const held = head!.subarray(0, filled);
    correct = estimate(held);
    const y = out.take(held.length + tail.length);
    correct(held, y.subarray(0, held.length));
    if (tail.length > 0) correct(tail, y.subarray(held.length));
    head = null;
    return y;
  }

  return {
    process(block) {
      if (correct) {
        const y = out.take(block.length);
        correct(block, y);
        return y;
      }
      const take = Math.min(capacity - filled, block.length);
      head!.set(block.subarray(0, take), filled);
      filled += take;
      if (filled < capacity) return EMPTY_BLOCK;
      return releaseHead(block.subarray(take));
    },
    finish() {
      if (correct || filled === 0) return EMPTY_BLOCK;
      return releaseHead(EMPTY_BLOCK);
    },
  };
}
