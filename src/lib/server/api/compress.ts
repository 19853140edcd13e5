/**
 * Compression of JSON answers: a run's results or a capture list run to tens of kB of JSON that
 * compresses five- to tenfold. Small answers, event streams and sample data stay as they are
 * (sample data are binary and often ranged; an event stream must reach the page as it is written).
 */
import { promisify } from 'node:util';
import { brotliCompress, constants, gzip } from 'node:zlib';

/** Answers smaller than this (bytes) go out plain: compressing them saves less than it costs. */
export const compressMinBytes = 2048;

const brotli = promisify(brotliCompress);
const gzipAsync = promisify(gzip);

/** The coding to use for an Accept-Encoding header: brotli, else gzip, else none. */
export function negotiateEncoding(acceptEncoding: string | null): 'br' | 'gzip' | null {
  const accepted = new Map<string, number>();
  for (const part of (acceptEncoding ?? '').split(',')) {
    const [name, ...params] = part.trim().toLowerCase().split(';');
    if (!name) continue;
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    accepted.set(name, q ? Number(q.slice(2)) : 1);
  }
  const allows = (coding: string) => (accepted.get(coding) ?? accepted.get('*') ?? 0) > 0;
  if (allows('br')) return 'br';
  if (allows('gzip')) return 'gzip';
  return null;
}

/** `response` compressed for `request` when it is a JSON answer of at least compressMinBytes and the client accepts a coding. */
export async function compressJson(request: Request, response: Response): Promise<Response> {
  const type = response.headers.get('content-type') ?? '';
  if (!type.startsWith('application/json') || request.method === 'HEAD' || !response.body) return response;
  if (response.status === 206 || response.headers.has('content-encoding')) return response;
  const coding = negotiateEncoding(request.headers.get('accept-encoding'));
  const headers = new Headers(response.headers);
  headers.append('Vary', 'Accept-Encoding');
  const plain = Buffer.from(await response.arrayBuffer());
  if (!coding || plain.length < compressMinBytes) return new Response(plain, { status: response.status, statusText: response.statusText, headers });
  // zlib's asynchronous calls run on libuv's thread pool, off the web thread; quality 5 is the
  // usual balance for answers compressed on every request (11 is for files compressed once).
  const body =
    coding === 'br'
      ? await brotli(plain, { params: { [constants.BROTLI_PARAM_QUALITY]: 5, [constants.BROTLI_PARAM_SIZE_HINT]: plain.length } })
      : await gzipAsync(plain, { level: 6 });
  headers.set('Content-Encoding', coding);
  headers.delete('Content-Length');
  return new Response(body, { status: response.status, statusText: response.statusText, headers });
}
