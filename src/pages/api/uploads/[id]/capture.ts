import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { json } from '@/lib/server/api/respond';
import { notFound } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { captureErrorResponse, DuplicateCaptureError, findCapture, presentCapture } from '@/lib/server/captures';
import { findUpload, storedError } from '@/lib/server/uploads';

/**
 * What a completed resumable upload became: 200 with the capture, 409 duplicate with the
 * existing capture, or the refusal (4xx) recorded when the last byte arrived; 202 while bytes
 * are still expected.
 */
export const GET = endpoint(async (context) => {
  authorize(context, 'capture.create');
  const user = context.locals.user!;
  const db = getDb();
  const upload = await findUpload(db, context.params.id ?? '');
  if (!upload || upload.owner_id !== user.id) throw notFound('upload');
  if (upload.status === 'receiving') return json({ status: 'receiving', uploadLength: Number(upload.upload_length) }, 202);
  if (upload.status === 'failed') throw storedError(upload);
  const capture = upload.capture_id ? await findCapture(db, upload.capture_id) : undefined;
  if (!capture) throw notFound('capture');
  if (upload.status === 'duplicate') return captureErrorResponse(new DuplicateCaptureError(capture), user);
  return json(presentCapture(capture, user));
});
