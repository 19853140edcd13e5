/**
 * Server settings every part shares, as named views of the one configuration (src/lib/config).
 */
import { config } from '../config';

/** Folder holding the database and stored sample files (QUADRILLE_DATA_DIR, default ./data), absolute. */
export function dataDir(): string {
  return config().QUADRILLE_DATA_DIR;
}

/** True when NODE_ENV is production: session cookies then carry the Secure flag. */
export function isProduction(): boolean {
  return config().NODE_ENV === 'production';
}

/** True unless QUADRILLE_DEMO=0: whether `npm start` seeds the Saltmarsh demo. */
export function demoEnabled(): boolean {
  return config().QUADRILLE_DEMO;
}

/** True unless QUADRILLE_DEMO_CAPTURES=0: whether the demo seed synthesizes its captures. */
export function demoCapturesEnabled(): boolean {
  return config().QUADRILLE_DEMO_CAPTURES;
}
