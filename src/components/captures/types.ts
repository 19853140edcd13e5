/**
 * Shapes of the captures API as the browser sees them (a capture itself is the contract's, in
 * src/contracts/capture.ts), and small readers of the SigMF annotation objects a capture carries.
 */
import type { SampleType } from '@/dsp/types';

export type { Capture, CaptureList, StorageUsage } from '@/contracts/capture';

/** A SigMF annotation read into numbers (samples, Hz), whatever spelling the object used. */
export interface Annotation {
  sampleStart: number;
  sampleCount: number | null;
  freqLowerEdge: number | null;
  freqUpperEdge: number | null;
  label: string;
  comment: string;
}

function pick(object: Record<string, unknown>, ...keys: string[]): unknown {
  for (const key of keys) if (object[key] !== undefined && object[key] !== null) return object[key];
  return undefined;
}

function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

/** Reads SigMF annotation objects (core: keys, or the camel-case spelling of the formats code). */
export function readAnnotations(raw: unknown): Annotation[] {
  if (!Array.isArray(raw)) return [];
  return raw
    .filter((a): a is Record<string, unknown> => typeof a === 'object' && a !== null)
    .map((a) => ({
      sampleStart: numberOrNull(pick(a, 'core:sample_start', 'sampleStart')) ?? 0,
      sampleCount: numberOrNull(pick(a, 'core:sample_count', 'sampleCount')),
      freqLowerEdge: numberOrNull(pick(a, 'core:freq_lower_edge', 'freqLowerEdge')),
      freqUpperEdge: numberOrNull(pick(a, 'core:freq_upper_edge', 'freqUpperEdge')),
      label: String(pick(a, 'core:label', 'label') ?? ''),
      comment: String(pick(a, 'core:comment', 'comment') ?? ''),
    }));
}

/** Human label of a channel layout. */
export const LAYOUT_LABELS: Record<SampleType, string> = {
  complex: 'Complex I/Q',
  real: 'Real IF',
  'real-pair': 'Two real channels',
};
