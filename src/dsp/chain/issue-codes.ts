/**
 * Stable ids of the issues the chain validator and the propagation report (ChainIssue.code). Stage
 * kinds may report their own codes from `propagate`; they should reuse these where one fits, so the
 * editor can group them.
 */
export const ISSUE_CODES = {
  /** The document is not an object of the expected shape. */
  invalidDocument: 'invalid-document',
  unsupportedVersion: 'unsupported-version',
  invalidStageId: 'invalid-stage-id',
  duplicateStageId: 'duplicate-stage-id',
  unknownStageKind: 'unknown-stage-kind',
  invalidParameter: 'invalid-parameter',
  unknownParameter: 'unknown-parameter',
  /** A stage needs another sample type than it is fed (e.g. complex-only fed real). */
  inputTypeMismatch: 'input-type-mismatch',
  /** A filter edge (cutoff, low, high) at or above the Nyquist frequency of its input. */
  cutoffAboveNyquist: 'cutoff-above-nyquist',
  /** An LO or shift frequency beyond the Nyquist frequency (it acts as its alias). */
  frequencyAboveNyquist: 'frequency-above-nyquist',
  /** A rate reduction with no band-limiting filter before it and no built-in anti-alias filter. */
  decimateWithoutAntiAlias: 'decimate-without-anti-alias',
  /** A rate reduction whose new Nyquist frequency lies below the preceding filter's stop-band edge. */
  decimateAliasing: 'decimate-aliasing',
  /** An IIR design with poles on or outside the unit circle (reported by the filter stage). */
  unstableFilter: 'unstable-filter',
  /** A stage's own propagate failed unexpectedly. */
  propagateFailed: 'propagate-failed',
} as const;
