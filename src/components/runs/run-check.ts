/**
 * Whether a chain revision can run on a capture, checked in the browser the way the server checks
 * a run request (the engine's format propagation), so the dialog can say why before asking.
 */
import { propagateChain } from '@/dsp/chain/propagate';
import type { ChainDocument } from '@/dsp/chain/document';
import type { StreamFormat } from '@/dsp/types';
import type { Capture } from '../captures/types';

/** The stream format a capture feeds into a chain. */
export function captureFormat(capture: Pick<Capture, 'sampleRate' | 'layout' | 'centerFrequency'>): StreamFormat {
  const format: StreamFormat = { sampleRate: capture.sampleRate, sampleType: capture.layout };
  if (capture.centerFrequency !== null) format.centerFrequency = capture.centerFrequency;
  return format;
}

/** The first error that stops `document` running on `capture`, or null when it can run. */
export function runBlocker(document: unknown, capture: Pick<Capture, 'sampleRate' | 'layout' | 'centerFrequency'>): string | null {
  try {
    const issues = propagateChain(document as ChainDocument, captureFormat(capture)).flatMap((stage) => stage.issues);
    return issues.find((issue) => issue.severity === 'error')?.message ?? null;
  } catch (error) {
    return (error as Error).message;
  }
}
