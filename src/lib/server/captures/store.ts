/**
 * The object store captures live in: one per process, chosen by QUADRILLE_STORAGE. The demo seed
 * runs before the server starts (npm start, the test helper) with only a database handle, so it
 * can also build the store of the data folder that database lives in.
 */
import { dirname } from 'node:path';
import type { Knex } from 'knex';
import { config } from '../../config';
import { createObjectStore, readStorageConfig, storageConfigOf, type ObjectStore } from '../storage';

let shared: ObjectStore | null = null;

/** The server's object store (built on first use from the environment). */
export function getObjectStore(): ObjectStore {
  shared ??= createObjectStore(readStorageConfig());
  return shared;
}

/** The object store belonging to the data folder of the SQLite database behind `db`. */
export function objectStoreForDatabase(db: Knex): ObjectStore {
  const connection = db.client.config.connection as { filename?: string } | undefined;
  const filename = connection?.filename;
  if (!filename) return getObjectStore();
  return createObjectStore(storageConfigOf(config(), dirname(filename)));
}

/** The object key of a capture's samples; a fresh capture id makes every put a fresh key. */
export function captureObjectKey(captureId: string): string {
  return `captures/${captureId}`;
}
