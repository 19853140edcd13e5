/**
 * HTTP answers particular to captures: the 409 duplicate (which carries the existing capture),
 * streamed file bodies and their Content-Disposition.
 */
import { Readable } from 'node:stream';
import type { Actor } from '@/lib/permissions';
import { apiErrorBody } from '../api/errors';
import { errorResponse, json } from '../api/respond';
import { DuplicateCaptureError } from './errors';
import { presentCapture } from './present';

/** The error answer for a capture command; a duplicate carries the existing capture. */
export function captureErrorResponse(error: unknown, viewer: Actor, headers: Record<string, string> = {}): Response {
  if (error instanceof DuplicateCaptureError) {
    return json(
      { ...apiErrorBody(error), capture: presentCapture(error.existing, viewer) },
      409,
      headers,
    );
  }
  const response = errorResponse(error);
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}

/** `attachment` with an ASCII file name and its UTF-8 form (RFC 6266). */
export function contentDisposition(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

/** A streamed body as a web ReadableStream (back-pressure passes through to the object store). */
export function webStream(body: AsyncIterable<Uint8Array> | Readable): ReadableStream<Uint8Array> {
  const readable = body instanceof Readable ? body : Readable.from(body, { objectMode: false });
  return Readable.toWeb(readable) as ReadableStream<Uint8Array>;
}
