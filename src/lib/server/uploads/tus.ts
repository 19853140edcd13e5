/**
 * The resumable upload endpoint (tus protocol 1.0: creation, HEAD/PATCH resume, termination,
 * expiration) on @tus/server's web-standard handler. Partial bytes go to a file store under the
 * data folder; when the last byte arrives the file is streamed into the object store through the
 * same capture command as a one-request upload, the outcome is recorded for
 * GET /api/uploads/:id/capture, and the partial file is removed.
 */
import { randomBytes } from 'node:crypto';
import { Server, type Upload } from '@tus/server';
import { FileStore } from '@tus/file-store';
import type { SessionUser } from '../auth/session';
import { ApiError, apiErrorBody, notFound, unauthenticated, unprocessable } from '../api/errors';
import { getDb } from '../db';
import { assertFits, captureAllowance } from '../quota';
import { bytesPerSampleOf, createCapture, DuplicateCaptureError, getObjectStore, ingestError, jsonFieldNames } from '../captures';
import { parseUploadMetadata } from './metadata';
import { findUpload, insertUpload, recordOutcome } from './rows';
import { uploadFolder, uploadLifetimeMs } from './config';
import { sweepExpiredUploads } from './sweep';

/** The URL path of the endpoint; upload URLs are `${UPLOADS_PATH}/<id>`. */
export const UPLOADS_PATH = '/api/uploads';

/** Who sent each request: the hooks see only the Request, the endpoint knows the session. */
const senders = new WeakMap<Request, SessionUser>();

/** tus hooks throw `{ status_code, body }`; ours carry the API's JSON error as the body. */
function tusError(error: unknown): { status_code: number; body: string } {
  const mapped = ingestError(error, null);
  if (mapped instanceof ApiError) {
    return { status_code: mapped.status, body: JSON.stringify(apiErrorBody(mapped)) };
  }
  throw mapped;
}

function senderOf(request: Request): SessionUser {
  const user = senders.get(request);
  if (!user) throw tusError(unauthenticated());
  return user;
}

let server: Server | null = null;
let store: FileStore | null = null;

/** Creation: the metadata must describe an acceptable capture and its length fit the quota. */
async function onUploadCreate(request: Request, upload: Upload): Promise<{ metadata?: Upload['metadata'] }> {
  const user = senderOf(request);
  try {
    if (upload.sizeIsDeferred || upload.size === undefined) {
      throw new ApiError(400, 'required', 'Upload-Length is required: the size is checked against the quota before bytes travel.', 'Upload-Length');
    }
    const intent = parseUploadMetadata(upload.metadata ?? {});
    if (intent.description) {
      const bytesPerSample = bytesPerSampleOf(intent.description.datatype, intent.description.layout);
      if (upload.size === 0 || upload.size % bytesPerSample !== 0) {
        throw unprocessable(
          'invalid_field',
          `Upload-Length: ${upload.size} bytes is not a whole number of ${bytesPerSample}-byte samples (${intent.description.datatype.name}, ${intent.description.layout}).`,
          'Upload-Length',
        );
      }
    }
    assertFits(await captureAllowance(getDb(), user.id), upload.size, 'Upload-Length');
    await insertUpload(getDb(), { id: upload.id, ownerId: user.id, metadata: upload.metadata ?? {}, length: upload.size }, uploadLifetimeMs());
    return {};
  } catch (error) {
    throw tusError(error);
  }
}

/** Every request on an existing upload: only its owner may see or touch it. */
async function onIncomingRequest(request: Request, id: string): Promise<void> {
  if (request.method === 'POST') return;
  const user = senderOf(request);
  const row = await findUpload(getDb(), id);
  if (!row || row.owner_id !== user.id) throw tusError(notFound('upload'));
}

/** Last byte arrived: stream the file into the object store as a capture and record the outcome. */
async function onUploadFinish(request: Request, upload: Upload): Promise<{ status_code?: number }> {
  const user = senderOf(request);
  const db = getDb();
  const row = await findUpload(db, upload.id);
  if (!row) throw tusError(notFound('upload'));
  try {
    const intent = parseUploadMetadata(JSON.parse(row.metadata) as Record<string, string | null>);
    const file = store!.read(upload.id);
    try {
      const capture = await createCapture(db, getObjectStore(), {
        owner: user,
        stated: intent.stated,
        described: intent.described,
        names: jsonFieldNames,
        format: intent.format,
        asComplex: intent.asComplex,
        source: file[Symbol.asyncIterator]() as AsyncIterator<Uint8Array>,
        announcedBytes: upload.size ?? null,
        origin: 'uploaded',
      });
      await recordOutcome(db, upload.id, { status: 'completed', captureId: capture.id });
    } finally {
      file.destroy();
    }
  } catch (error) {
    const mapped = ingestError(error, null);
    if (mapped instanceof DuplicateCaptureError) await recordOutcome(db, upload.id, { status: 'duplicate', captureId: mapped.existing.id });
    else if (mapped instanceof ApiError) await recordOutcome(db, upload.id, { status: 'failed', error: mapped });
    else {
      console.error(`Upload ${upload.id} could not become a capture:`, mapped);
      await recordOutcome(db, upload.id, { status: 'failed', error: new ApiError(500, 'internal_error', 'The upload could not be stored.') });
    }
  } finally {
    await store!.remove(upload.id).catch(() => undefined);
  }
  // The upload itself succeeded; whether it became a capture is for GET /api/uploads/:id/capture.
  return {};
}

/** The tus server of this process (and its file store), made on first use. */
export function tusServer(): { server: Server; store: FileStore } {
  if (!server || !store) {
    store = new FileStore({ directory: uploadFolder(), expirationPeriodInMilliseconds: uploadLifetimeMs() });
    server = new Server({
      path: UPLOADS_PATH,
      datastore: store,
      relativeLocation: true,
      // Same-origin only: no Access-Control-Allow-Origin header.
      allowedOrigins: [],
      // A finished upload has already become a capture (or been refused); nothing to terminate.
      disableTerminationForFinishedUploads: true,
      namingFunction: () => randomBytes(16).toString('hex'),
      onUploadCreate: onUploadCreate as never,
      onIncomingRequest: onIncomingRequest as never,
      onUploadFinish: onUploadFinish as never,
    });
  }
  return { server, store };
}

/** Handles one tus request for `user`; JSON errors get their Content-Type. */
export async function handleTus(request: Request, user: SessionUser): Promise<Response> {
  const { server: tus, store: files } = tusServer();
  void sweepExpiredUploads(getDb(), tus, files);
  senders.set(request, user);
  const response = await tus.handleWeb(request);
  if (request.method === 'DELETE' && response.status === 204) {
    const id = decodeURIComponent(new URL(request.url).pathname.split('/').pop() ?? '');
    await getDb()('capture_uploads').where({ id, owner_id: user.id }).delete();
  }
  if (response.status >= 400 && !(response.headers.get('content-type') ?? '').includes('json')) {
    // The protocol library answers its own errors in plain text; the API speaks JSON.
    const text = (await response.text()).trim();
    const body = text.startsWith('{') ? text : JSON.stringify({ error: { code: 'upload_error', message: text, field: null } });
    const headers = new Headers(response.headers);
    headers.set('Content-Type', 'application/json; charset=utf-8');
    headers.delete('Content-Length');
    return new Response(body, { status: response.status, headers });
  }
  return response;
}

