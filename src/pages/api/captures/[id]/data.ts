import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { ApiError } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { RangeNotSatisfiableError, type ByteRange } from '@/lib/server/storage';
import { contentDisposition, fileStem, getObjectStore, loadCaptureFor, webStream } from '@/lib/server/captures';

/**
 * One `bytes=` range of RFC 9110 section 14.1.2 (`a-b`, `a-`, or the suffix `-n`) as an
 * inclusive range of an object of `size` bytes. Several ranges or a malformed header are
 * ignored (the whole object is sent), as the RFC allows; null means "whole object".
 */
function parseRange(header: string | null, size: number): ByteRange | null | 'unsatisfiable' {
  if (!header) return null;
  const match = /^bytes=(\d*)-(\d*)$/.exec(header.trim());
  if (!match || (match[1] === '' && match[2] === '')) return null;
  if (match[1] === '') {
    const suffix = Number(match[2]);
    if (suffix === 0 || size === 0) return 'unsatisfiable';
    return { start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(match[1]);
  const end = match[2] === '' ? undefined : Number(match[2]);
  if (end !== undefined && end < start) return null;
  if (start >= size) return 'unsatisfiable';
  return { start, end };
}

/** The capture's sample bytes, whole or one byte range (206), for download and the quick look. */
export const GET = endpoint(async (context) => {
  authorize(context, 'capture.read');
  const row = await loadCaptureFor(getDb(), context.locals.user, context.params.id ?? '', 'capture.read');
  const size = Number(row.byte_size);
  const range = parseRange(context.request.headers.get('range'), size);
  const unsatisfiable = () =>
    new ApiError(416, 'range_not_satisfiable', `The capture has ${size} bytes.`, null, { 'Content-Range': `bytes */${size}` });
  if (range === 'unsatisfiable') throw unsatisfiable();
  let read;
  try {
    read = await getObjectStore().get(row.storage_key, range ?? undefined);
  } catch (error) {
    if (error instanceof RangeNotSatisfiableError) throw unsatisfiable();
    throw error;
  }
  const headers: Record<string, string> = {
    'Content-Type': 'application/octet-stream',
    'Content-Length': String(read.length),
    'Accept-Ranges': 'bytes',
    'Content-Disposition': contentDisposition(`${fileStem(row.name)}.sigmf-data`),
    ETag: `"${row.sha256}"`,
    'Cache-Control': 'private, no-cache',
  };
  if (range) headers['Content-Range'] = `bytes ${read.start}-${read.end}/${read.size}`;
  if (context.request.method === 'HEAD') {
    // Astro drops a HEAD answer's body unread: close the object's stream here or it stays open.
    read.stream.destroy();
    return new Response(null, { status: range ? 206 : 200, headers });
  }
  return new Response(webStream(read.stream), { status: range ? 206 : 200, headers });
});
