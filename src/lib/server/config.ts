/**
 * Settings read from the environment once, in one place, so every part of the server agrees.
 * Read through a local alias of process.env so the bundler cannot bake build-time values in.
 */
import { resolve } from 'node:path';

const env = process.env;

/** Folder holding the database and stored sample files (QUADRILLE_DATA_DIR, default ./data). */
export function dataDir(): string {
  return resolve(env.QUADRILLE_DATA_DIR || 'data');
}

/** True when NODE_ENV is production: session cookies then carry the Secure flag. */
export function isProduction(): boolean {
  return env.NODE_ENV === 'production';
}

/** True unless QUADRILLE_DEMO=0: whether `npm start` seeds the Saltmarsh demo. */
export function demoEnabled(): boolean {
  return env.QUADRILLE_DEMO !== '0';
}
