/**
 * Resumable upload settings:
 *
 *   QUADRILLE_UPLOAD_EXPIRY_HOURS   hours an unfinished upload is kept, counted from its creation
 *                                   (default 24); later its partial bytes are deleted and a resume
 *                                   answers 404/410
 *
 * Partial uploads live under `<QUADRILLE_DATA_DIR>/uploads` (local disk whatever the object store):
 * a resumable upload appends at an offset, which object stores cannot do.
 */
import { join } from 'node:path';
import { dataDir } from '../config';

const env = process.env;

/** How long an unfinished upload is kept (ms). */
export function uploadLifetimeMs(): number {
  const text = (env.QUADRILLE_UPLOAD_EXPIRY_HOURS ?? '').trim();
  const hours = text ? Number(text) : 24;
  if (!Number.isFinite(hours) || hours <= 0) throw new Error(`QUADRILLE_UPLOAD_EXPIRY_HOURS must be a number of hours > 0, got "${text}"`);
  return hours * 3600 * 1000;
}

/** Folder of partial uploads. */
export function uploadFolder(): string {
  return join(dataDir(), 'uploads');
}
