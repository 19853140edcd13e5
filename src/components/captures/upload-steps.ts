/**
 * The steps of an upload after the form checks pass: the pre-check (with the sha256 of files small
 * enough to hash in the browser), the transfer, and reading the capture the server made of it.
 */
import { apiErrorOf } from '@/contracts/errors';
import { requestJson, type ApiError } from '@/components/query/fetch';
import type { PickedUpload } from './upload-files';
import type { UploadDescription } from './upload-form';
import type { Capture } from './types';

/** Largest file hashed in the browser before upload (bytes): hashing needs the whole file in memory. */
export const HASH_LIMIT_BYTES = 256 * 2 ** 20;

/** Hex sha256 of a blob, or null when it is too large or the browser offers no crypto.subtle (plain http). */
export async function sha256Of(blob: Blob): Promise<string | null> {
  if (blob.size > HASH_LIMIT_BYTES || typeof crypto === 'undefined' || !crypto.subtle) return null;
  const digest = await crypto.subtle.digest('SHA-256', await blob.arrayBuffer());
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Outcome of the pre-check: go ahead, an identical capture exists, or the server's objection. */
export type PreCheck = { kind: 'ok' } | { kind: 'duplicate'; capture: Capture } | { kind: 'refused'; error: ApiError };

/** Asks the server whether this upload would be accepted, before its bytes travel. */
export async function preCheck(description: UploadDescription, picked: PickedUpload, sha256: string | null): Promise<PreCheck> {
  const result = await requestJson<{ ok: true; duplicate?: Capture }>('POST', '/api/captures/check', {
    name: description.name,
    datatype: description.datatype,
    layout: description.layout,
    sampleRate: description.sampleRate,
    centerFrequency: description.centerFrequency,
    visibility: description.visibility,
    tags: description.tags,
    notes: description.notes,
    byteSize: picked.sampleBytes,
    ...(sha256 ? { sha256 } : {}),
  });
  if (!result.ok) return { kind: 'refused', error: result.error };
  return result.data.duplicate ? { kind: 'duplicate', capture: result.data.duplicate } : { kind: 'ok' };
}

/** The tus metadata of an upload: the description, plus the meta text or the WAV flag. */
export function uploadMetadata(description: UploadDescription, picked: PickedUpload): Record<string, string> {
  const metadata: Record<string, string> = {
    name: description.name,
    visibility: description.visibility,
    tags: description.tags.join(','),
    notes: description.notes,
  };
  if (picked.kind === 'sigmf') {
    // core:sample_rate is optional in SigMF: the form asks for it when the meta leaves it out.
    const rate: Record<string, string> = picked.stated.sampleRate === undefined ? { sampleRate: String(description.sampleRate) } : {};
    return { ...metadata, ...rate, sigmfMeta: picked.sigmfMeta ?? '' };
  }
  if (picked.kind === 'wav') {
    // The header gives datatype and rate; the layout says whether two channels are I and Q.
    return { ...metadata, wav: '1', layout: description.layout, ...(description.centerFrequency !== null ? { centerFrequency: String(description.centerFrequency) } : {}) };
  }
  return {
    ...metadata,
    datatype: description.datatype,
    layout: description.layout,
    sampleRate: String(description.sampleRate),
    ...(description.centerFrequency !== null ? { centerFrequency: String(description.centerFrequency) } : {}),
  };
}

/** Outcome of a finished upload: the capture, an identical one already stored, or the refusal. */
export type Finished = { kind: 'created'; capture: Capture } | { kind: 'duplicate'; capture: Capture } | { kind: 'refused'; error: ApiError };

/** Reads the capture the server made of a finished upload (a 409 carries the existing capture beside the error). */
export async function finishedCapture(uploadId: string): Promise<Finished> {
  const result = await requestJson<Capture>('GET', `/api/uploads/${encodeURIComponent(uploadId)}/capture`);
  if (result.ok) return { kind: 'created', capture: result.data };
  if (result.status === 0) {
    return { kind: 'refused', error: { code: 'network', message: 'The server could not be reached to confirm the upload. Reload the captures list to see whether it was stored.', field: null } };
  }
  const error = errorOfBody(JSON.stringify(result.body ?? {}));
  if (result.status === 409 && error?.capture) return { kind: 'duplicate', capture: error.capture };
  return { kind: 'refused', error: result.error };
}

/** The API error inside a tus failure's response body, if it has one. */
export function errorOfBody(body: string): (ApiError & { capture?: Capture }) | null {
  try {
    const parsed = JSON.parse(body) as { capture?: Capture };
    const error = apiErrorOf(parsed);
    if (error) return parsed.capture ? { ...error, capture: parsed.capture } : error;
  } catch {
    // Not JSON: a proxy page or an empty body.
  }
  return null;
}
