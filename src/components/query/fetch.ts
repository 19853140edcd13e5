/**
 * The one way the browser side calls the API. `requestJson` answers an ApiResult (forms show the
 * error beside a field); `apiJson` throws an ApiRequestError instead, for TanStack Query's query
 * and mutation functions, which expect a failure to throw.
 */

import { apiErrorOf, type ApiErrorInfo } from '@/contracts/errors';

/** The error every Quadrille endpoint answers with (`{ error: ApiError }`, src/contracts/errors.ts), or one made here for a network failure. */
export type ApiError = ApiErrorInfo;

/** The outcome of a JSON request: the parsed body on success, the API error otherwise. */
export type ApiResult<T> =
  | { ok: true; status: number; data: T }
  /** `body` is the whole parsed error answer, for the few that carry more beside the error (a 409's duplicate). */
  | { ok: false; status: number; error: ApiError; body?: unknown };

/** Send JSON to an endpoint and read the answer; network failures become an ApiError too. */
export async function requestJson<T>(method: string, url: string, body?: unknown): Promise<ApiResult<T>> {
  let response: Response;
  try {
    response = await fetch(url, {
      method,
      credentials: 'same-origin',
      headers: body === undefined ? { accept: 'application/json' } : { 'content-type': 'application/json', accept: 'application/json' },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, status: 0, error: { code: 'network', message: 'The server could not be reached. Check the connection and try again.', field: null } };
  }
  const text = await response.text();
  let parsed: unknown = null;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    // A proxy error page or similar: fall through to the generic message below.
  }
  if (response.ok) return { ok: true, status: response.status, data: parsed as T };
  const error = apiErrorOf(parsed);
  if (error) return { ok: false, status: response.status, error, body: parsed };
  return {
    ok: false,
    status: response.status,
    error: { code: 'http_' + response.status, message: `The server answered ${response.status} ${response.statusText}.`.trim(), field: null },
  };
}

/** An API error thrown by apiJson: the message is the API's, code, field and status ride along. */
export class ApiRequestError extends Error {
  readonly code: string;
  readonly field: string | null;
  readonly status: number;

  constructor(status: number, error: ApiError) {
    super(error.message);
    this.name = 'ApiRequestError';
    this.code = error.code;
    this.field = error.field ?? null;
    this.status = status;
  }
}

/** Like requestJson, but answers the body and throws an ApiRequestError on failure. */
export async function apiJson<T>(method: string, url: string, body?: unknown): Promise<T> {
  const result = await requestJson<T>(method, url, body);
  if (!result.ok) throw new ApiRequestError(result.status, result.error);
  return result.data;
}

/** A failure thrown by apiJson (or anything else thrown) as the failing ApiResult, for forms that place errors by field. */
export function failureOf(error: unknown): { ok: false; status: number; error: ApiError } {
  if (error instanceof ApiRequestError) return { ok: false, status: error.status, error: { code: error.code, message: error.message, field: error.field } };
  return { ok: false, status: 0, error: { code: 'unexpected', message: error instanceof Error ? error.message : String(error), field: null } };
}

/** A query string from parameters; undefined, empty and non-finite values are left out. */
export function queryString(params: object): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value === undefined || value === null || value === '' || (typeof value === 'number' && !Number.isFinite(value))) continue;
    search.set(key, String(value));
  }
  return search.toString();
}

/** A mutation's outcome as an ApiResult, for forms that place a failure beside its field rather than catch it (status 200 stands for any success). */
export async function settled<T>(promise: Promise<T>): Promise<ApiResult<T>> {
  try {
    return { ok: true, status: 200, data: await promise };
  } catch (error) {
    return failureOf(error);
  }
}
