import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { badRequest } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import {
  contentDisposition,
  exportFormats,
  exportSigmfArchive,
  exportSigmfMeta,
  exportWav,
  getObjectStore,
  loadCaptureFor,
  webStream,
  type ExportFile,
} from '@/lib/server/captures';

/** The capture as a `.sigmf-meta`, a `.sigmf` archive or (real layouts, 8/16/32-bit) a WAV file. */
export const GET = endpoint(async (context) => {
  authorize(context, 'capture.read');
  const row = await loadCaptureFor(getDb(), context.locals.user, context.params.id ?? '', 'capture.read');
  const format = context.url.searchParams.get('format') ?? 'sigmf';
  if (!(exportFormats as readonly string[]).includes(format)) {
    throw badRequest('invalid_field', `format must be one of ${exportFormats.join(', ')}.`, 'format');
  }
  let file: ExportFile;
  if (format === 'sigmf-meta') file = exportSigmfMeta(row);
  else if (format === 'wav') file = exportWav(row, getObjectStore());
  else file = exportSigmfArchive(row, getObjectStore());
  const headers = {
    'Content-Type': file.contentType,
    'Content-Length': String(file.length),
    'Content-Disposition': contentDisposition(file.fileName),
    'Cache-Control': 'private, no-cache',
  };
  // A HEAD answer's body would be dropped unread, leaving the object's stream open: send none.
  if (context.request.method === 'HEAD') return new Response(null, { headers });
  return new Response(webStream(file.body), { headers });
});
