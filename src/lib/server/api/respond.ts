/**
 * The one place API answers are rendered: JSON bodies, and errors as
 * `{ "error": { "code", "message", "field" } }` (plus any facts, see src/contracts/errors.ts).
 */
import type { ApiErrorBody } from '@/contracts/errors';
import { ApiError, apiErrorBody } from './errors';

const jsonHeaders = { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store' };

/** A JSON answer with `status` (default 200). */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { ...jsonHeaders, ...headers } });
}

/** An empty 204 answer. */
export function noContent(): Response {
  return new Response(null, { status: 204, headers: { 'Cache-Control': 'no-store' } });
}

/** Renders an ApiError; anything else is logged and becomes a 500 that reveals nothing. */
export function errorResponse(error: unknown): Response {
  if (error instanceof ApiError) {
    return json(apiErrorBody(error), error.status, error.headers);
  }
  console.error(error);
  const body: ApiErrorBody = { error: { code: 'internal_error', message: 'Something went wrong on the server.', field: null } };
  return json(body, 500);
}
