/**
 * Resumable uploads in flight (table capture_uploads): owner, the metadata given at creation,
 * and once complete the outcome that GET /api/uploads/:id/capture reports.
 */
import type { Knex } from 'knex';
import { ApiError } from '../api/errors';

export type UploadStatus = 'receiving' | 'completed' | 'duplicate' | 'failed';

export interface UploadRow {
  id: string;
  owner_id: string;
  /** JSON text: the tus metadata as sent (strings). */
  metadata: string;
  upload_length: number;
  status: UploadStatus;
  /** The new capture (completed) or the existing one (duplicate). */
  capture_id: string | null;
  error_status: number | null;
  /** JSON text: `{ code, message, field }` of a refusal. */
  error: string | null;
  created_at: string;
  expires_at: string;
}

/** The upload row, or undefined. */
export function findUpload(db: Knex, id: string): Promise<UploadRow | undefined> {
  return db<UploadRow>('capture_uploads').where({ id }).first();
}

/** Records a new upload that will expire after `lifetimeMs` (ms). */
export async function insertUpload(
  db: Knex,
  upload: { id: string; ownerId: string; metadata: Record<string, string | null>; length: number },
  lifetimeMs: number,
): Promise<void> {
  const now = Date.now();
  await db<UploadRow>('capture_uploads').insert({
    id: upload.id,
    owner_id: upload.ownerId,
    metadata: JSON.stringify(upload.metadata),
    upload_length: upload.length,
    status: 'receiving',
    capture_id: null,
    error_status: null,
    error: null,
    created_at: new Date(now).toISOString(),
    expires_at: new Date(now + lifetimeMs).toISOString(),
  });
}

/** Records the outcome of a completed upload. */
export async function recordOutcome(db: Knex, id: string, outcome: { status: UploadStatus; captureId?: string; error?: ApiError }): Promise<void> {
  await db<UploadRow>('capture_uploads')
    .where({ id })
    .update({
      status: outcome.status,
      capture_id: outcome.captureId ?? null,
      error_status: outcome.error?.status ?? null,
      error: outcome.error ? JSON.stringify({ code: outcome.error.code, message: outcome.error.message, field: outcome.error.field }) : null,
    });
}

/** The stored refusal as an ApiError. */
export function storedError(row: UploadRow): ApiError {
  const error = JSON.parse(row.error ?? '{}') as { code?: string; message?: string; field?: string | null };
  return new ApiError(row.error_status ?? 422, error.code ?? 'refused', error.message ?? 'The upload was refused.', error.field ?? null);
}
