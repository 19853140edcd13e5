/**
 * Turns what can go wrong while taking in a capture into API errors: format problems become 422
 * naming the field, the store's size limit becomes the quota's 413, a short body a 422 on `body`.
 */
import { FormatError } from '@/dsp/formats';
import { ApiError, badRequest, unprocessable } from '../api/errors';
import { ObjectLengthMismatchError, ObjectTooLargeError, StorageAbortedError } from '../storage';
import { quotaError, type Allowance } from '../quota';
import type { CaptureWithOwner } from './rows';

/** 409: these bytes are already stored by this user as `existing`. */
export class DuplicateCaptureError extends ApiError {
  constructor(readonly existing: CaptureWithOwner) {
    super(409, 'duplicate', `These bytes are already stored as "${existing.name}".`);
  }
}

/** The API error for a failure while taking in a capture (rethrows what is not ours to map). */
export function ingestError(error: unknown, allowance: Allowance | null): unknown {
  if (error instanceof ApiError) return error;
  if (error instanceof FormatError) {
    const field = error.field ?? 'body';
    const code = field === 'body' ? (error.code === 'truncated' ? 'truncated' : 'invalid_body') : 'invalid_field';
    return unprocessable(code, error.message, field);
  }
  if (error instanceof ObjectTooLargeError) {
    return allowance ? quotaError(allowance, null) : new ApiError(413, 'capture_too_large', error.message);
  }
  if (error instanceof ObjectLengthMismatchError) {
    return unprocessable('truncated', `body: expected ${error.expectedBytes} bytes of samples, the body carried ${error.receivedBytes}.`, 'body');
  }
  if (error instanceof StorageAbortedError) return badRequest('aborted', 'The upload was interrupted before it ended.', 'body');
  return error;
}
