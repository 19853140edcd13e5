/**
 * Whether a chain revision can run on a capture, checked in the browser the way the server checks
 * a run request (the engine's format propagation), so the dialog can say why before asking.
 */
import { propagateChain } from '@/dsp/chain/propagate';
import { storedChainDocumentOf } from '@/contracts/chain';
import { streamFormatOf, type CaptureFormat } from '@/contracts/capture';

/** The first error that stops `document` (a revision's, as the API answered it) running on `capture`, or null when it can run. */
export function runBlocker(document: unknown, capture: CaptureFormat): string | null {
  try {
    const issues = propagateChain(storedChainDocumentOf(document), streamFormatOf(capture)).flatMap((stage) => stage.issues);
    return issues.find((issue) => issue.severity === 'error')?.message ?? null;
  } catch (error) {
    return (error as Error).message;
  }
}
