/** Errors a chain run throws. */
import type { ChainIssue } from '../types';

/**
 * A chain could not run or a stage failed while running. `stageId` and `kind` name the stage;
 * `sampleIndex` is the index (samples from the start of that stage's input stream) of the first
 * sample of the block it was processing, 0 for problems found before the run.
 */
export class ChainRunError extends Error {
  override name = 'ChainRunError';
  /** Issues found before the run (empty when a stage failed while running). */
  readonly issues: ChainIssue[];

  constructor(
    message: string,
    readonly stageId: string,
    readonly kind: string,
    readonly sampleIndex: number,
    options: { cause?: unknown; issues?: ChainIssue[] } = {},
  ) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.issues = options.issues ?? [];
  }
}

/** The error a cancelled run throws: named 'AbortError' like the platform's own, with the signal's reason as cause. */
export function abortError(signal: AbortSignal): Error {
  const error = new Error('the chain run was cancelled', { cause: signal.reason });
  error.name = 'AbortError';
  return error;
}

/** True for the error a cancelled run throws (ours or the platform's). */
export function isAbortError(error: unknown): boolean {
  return error instanceof Error && error.name === 'AbortError';
}
