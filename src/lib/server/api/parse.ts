/**
 * Reading request bodies: size-capped, JSON only, validated by a zod schema whose first problem
 * becomes a 400 naming the field.
 */
import type { z, ZodIssue } from 'zod';
import { badRequest, payloadTooLarge, unsupportedMediaType } from './errors';

/** Default cap on a JSON body (bytes); forms here are small. */
export const defaultJsonLimitBytes = 64 * 1024;

/** Reads the body as UTF-8 text, stopping with 413 once it passes `limitBytes` (bytes). */
export async function readText(request: Request, limitBytes: number): Promise<string> {
  const declared = Number(request.headers.get('content-length'));
  if (Number.isFinite(declared) && declared > limitBytes) throw payloadTooLarge(limitBytes);
  if (!request.body) return '';
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limitBytes) {
      await reader.cancel();
      throw payloadTooLarge(limitBytes);
    }
    chunks.push(value);
  }
  return new TextDecoder().decode(Buffer.concat(chunks));
}

/** Turns the first zod issue into a 400 with a stable code and the field's dot path. */
export function issueToError(issue: ZodIssue) {
  const field = issue.path.join('.') || null;
  const label = field ?? 'The body';
  if (issue.code === 'invalid_type' && issue.received === 'undefined') {
    return badRequest('required', `${label} is required.`, field);
  }
  if (issue.code === 'too_big' && issue.type === 'string') {
    return badRequest('too_long', `${label} must be at most ${issue.maximum} characters.`, field);
  }
  if (issue.code === 'too_small' && issue.type === 'string') {
    return issue.minimum === 1
      ? badRequest('required', `${label} is required.`, field)
      : badRequest('too_short', `${label} must be at least ${issue.minimum} characters.`, field);
  }
  if (issue.code === 'unrecognized_keys') {
    return badRequest('unknown_field', `Unknown field ${issue.keys.join(', ')}.`, issue.keys[0] ?? field);
  }
  return badRequest('invalid_field', field ? `${field}: ${issue.message}` : issue.message, field);
}

/** Validates `value` with `schema`, throwing the first problem as a 400. */
export function parseWith<S extends z.ZodTypeAny>(schema: S, value: unknown): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw issueToError(result.error.issues[0]!);
  return result.data;
}

/** Reads a JSON body (415 if not JSON, 413 if too large, 400 `invalid_json` if malformed) and validates it. */
export async function readJson<S extends z.ZodTypeAny>(
  request: Request,
  schema: S,
  limitBytes = defaultJsonLimitBytes,
): Promise<z.infer<S>> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^application\/json\b/i.test(type.trim())) throw unsupportedMediaType('application/json');
  const text = await readText(request, limitBytes);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw badRequest('invalid_json', 'The body is not valid JSON.');
  }
  return parseWith(schema, value);
}
