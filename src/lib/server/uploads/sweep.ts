/**
 * Removal of abandoned uploads: partial files older than the upload lifetime (counted from
 * creation, QUADRILLE_UPLOAD_EXPIRY_HOURS) and upload rows past their expiry, whatever their
 * outcome. Runs at most every ten minutes, started by upload requests, so an idle server does
 * no work and a busy one never lets partial files pile up.
 */
import type { Knex } from 'knex';
import type { Server } from '@tus/server';
import type { FileStore } from '@tus/file-store';

const SWEEP_INTERVAL_MS = 10 * 60 * 1000;
let lastSweep = 0;
let running: Promise<void> | null = null;

/** Deletes expired partial uploads and their rows; never throws (failures are logged). */
export function sweepExpiredUploads(db: Knex, server: Server, files: FileStore, now = Date.now()): Promise<void> {
  if (running || now - lastSweep < SWEEP_INTERVAL_MS) return running ?? Promise.resolve();
  lastSweep = now;
  running = (async () => {
    try {
      const expired = await db('capture_uploads').where('expires_at', '<', new Date(now).toISOString()).select<{ id: string }[]>('id');
      for (const { id } of expired) await files.remove(id).catch(() => undefined);
      if (expired.length) await db('capture_uploads').whereIn('id', expired.map((row) => row.id)).delete();
      await server.cleanUpExpiredUploads();
    } catch (error) {
      console.error('Sweeping expired uploads failed:', error);
    } finally {
      running = null;
    }
  })();
  return running;
}
