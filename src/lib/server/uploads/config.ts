/**
 * Resumable upload settings. QUADRILLE_UPLOAD_EXPIRY_HOURS (src/lib/config) is how long an
 * unfinished upload is kept, counted from its creation; later its partial bytes are deleted and a
 * resume answers 404/410.
 *
 * Partial uploads live under `<QUADRILLE_DATA_DIR>/uploads` (local disk whatever the object store):
 * a resumable upload appends at an offset, which object stores cannot do.
 */
import { join } from 'node:path';
import { config } from '../../config';
import { dataDir } from '../config';

/** How long an unfinished upload is kept (ms). */
export function uploadLifetimeMs(): number {
  return config().QUADRILLE_UPLOAD_EXPIRY_HOURS * 3600 * 1000;
}

/** Folder of partial uploads. */
export function uploadFolder(): string {
  return join(dataDir(), 'uploads');
}
