import { apiErrorOf, type ApiErrorInfo } from '@/contracts/errors';

/** The error every Quadrille endpoint answers with (`{ error: ApiError }`), or one made here for a network failure. */
export type ApiError = ApiErrorInfo;

/** The outcome of a JSON request: the parsed body on success, the API error otherwise. */
export type ApiResult<T> = { ok: true; status: number; data: T } | { ok: false; status: number; error: ApiError };

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
  if (error) return { ok: false, status: response.status, error };
  return {
    ok: false,
    status: response.status,
    error: { code: 'http_' + response.status, message: `The server answered ${response.status} ${response.statusText}.`.trim(), field: null },
  };
}
