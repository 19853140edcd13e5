/**
 * Whether a chain revision can run on a capture, checked in the browser the way the server checks
 * a run request (the engine's format propagation), so the dialog can say why before asking.
 */
import { propagateChain } from '@/dsp/chain/propagate';
import type { StoredChainDocument } from '@/contracts/chain';
import { streamFormatOf, type CaptureFormat } from '@/contracts/capture';

/** The first error that stops a stored revision's `document` running on `capture`, or null when it can run. */
export function runBlocker(document: StoredChainDocument, capture: CaptureFormat): string | null {
  try {
    const issues = propagateChain(document, streamFormatOf(capture)).flatMap((stage) => stage.issues);
    return issues.find((issue) => issue.severity === 'error')?.message ?? null;
  } catch (error) {
    return (error as Error).message;
  }
}
