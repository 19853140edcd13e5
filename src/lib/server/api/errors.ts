/**
 * API errors: each carries an HTTP status, a stable machine-readable code, a sentence for people
 * and, when one input field is at fault, that field's name (dot path for nested fields). Facts
 * such as the stage or sample at fault travel as fields of their own (the body's shape is
 * `apiErrorBodySchema` in src/contracts/errors.ts).
 */
import type { ApiErrorBody, ApiErrorFacts } from '@/contracts/errors';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly field: string | null = null,
    /** Extra response headers, e.g. Retry-After. */
    readonly headers: Record<string, string> = {},
    /** Facts beside the message (stage, sample), rendered as fields of the error body. */
    readonly facts: ApiErrorFacts = {},
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

/** The JSON body that renders `error`. */
export function apiErrorBody(error: ApiError): ApiErrorBody {
  return { error: { code: error.code, message: error.message, field: error.field, ...error.facts } };
}

/** 400: the request is malformed or a field is invalid. */
export function badRequest(code: string, message: string, field: string | null = null): ApiError {
  return new ApiError(400, code, message, field);
}

/** 401: no valid session. */
export function unauthenticated(): ApiError {
  return new ApiError(401, 'unauthenticated', 'Sign in to continue.');
}

/** 403: signed in, but the role does not allow this. */
export function forbidden(message = 'Your role does not allow this.'): ApiError {
  return new ApiError(403, 'forbidden', message);
}

/** 404: no such item, or a private item of someone else (the two are not told apart). */
export function notFound(what = 'item'): ApiError {
  return new ApiError(404, 'not_found', `No such ${what}.`);
}

/** 405: the route exists but not with this method. */
export function methodNotAllowed(allowed: string[]): ApiError {
  return new ApiError(405, 'method_not_allowed', `Use ${allowed.join(' or ')}.`, null, { Allow: allowed.join(', ') });
}

/** 409: the request clashes with existing data (e.g. a taken e-mail). */
export function conflict(code: string, message: string, field: string | null = null): ApiError {
  return new ApiError(409, code, message, field);
}

/** 413: the body is larger than this endpoint accepts (bytes). */
export function payloadTooLarge(limitBytes: number): ApiError {
  return new ApiError(413, 'payload_too_large', `The request body is larger than ${limitBytes} bytes.`);
}

/** 415: the body is not of a type this endpoint reads. */
export function unsupportedMediaType(expected: string): ApiError {
  return new ApiError(415, 'unsupported_media_type', `Send the body as ${expected}.`);
}

/** 422: well-formed, but the change is not possible in the current state. */
export function unprocessable(code: string, message: string, field: string | null = null, facts: ApiErrorFacts = {}): ApiError {
  return new ApiError(422, code, message, field, {}, facts);
}

/** 429: too many attempts; retry after `retryAfterSeconds` (s). */
export function rateLimited(retryAfterSeconds: number): ApiError {
  const seconds = Math.max(1, Math.ceil(retryAfterSeconds));
  return new ApiError(429, 'rate_limited', `Too many attempts. Try again in ${describeWait(seconds)}.`, null, {
    'Retry-After': String(seconds),
  });
}

function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} s`;
  return `${Math.ceil(seconds / 60)} min`;
}
