/**
 * Work the server does once before answering its first request: apply pending migrations and drop
 * expired sessions. A server whose schema cannot be brought up to date must not serve, so a
 * failure here stops the process.
 */
import { getDb } from './db';
import { migrateToLatest } from './db/migration-source';
import { getLucia } from './auth/lucia';
import { startRunScheduler } from './runs/scheduler';

let ready: Promise<void> | null = null;

async function prepare(): Promise<void> {
  const applied = await migrateToLatest(getDb());
  if (applied.length > 0) console.log(`Applied migrations: ${applied.join(', ')}`);
  await getLucia().deleteExpiredSessions();
  // Runs left running by a process that died are queued again and the queue starts executing.
  await startRunScheduler();
}

/** Resolves once the database is ready; every caller shares one attempt. */
export function serverReady(): Promise<void> {
  ready ??= prepare().catch((error: unknown) => {
    console.error('Quadrille could not prepare its database:', error);
    process.exit(1);
  });
  return ready;
}
