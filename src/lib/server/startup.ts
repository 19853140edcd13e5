/**
 * Work the server does once before answering its first request: apply pending migrations, drop
 * expired sessions, give old results their summaries and start the run scheduler. scripts/serve.mjs
 * asks for it as soon as the server listens, so queued runs start without waiting for a visitor;
 * the middleware still waits for it before any request. A server whose schema cannot be brought up
 * to date must not serve, so a failure here stops the process.
 *
 * It also leaves a shutdown hook on globalThis for scripts/serve.mjs (which runs outside the
 * bundle): on SIGTERM/SIGINT executing runs get a grace period, then go back to the queue.
 */
import { getDb } from './db';
import { migrateToLatest } from './db/migration-source';
import { getLucia } from './auth/lucia';
import { backfillResultSummaries } from './runs/backfill';
import { startRunScheduler, stopRunScheduler } from './runs/scheduler';
import { shutdownGraceMs } from './runs/config';

let ready: Promise<void> | null = null;

async function prepare(): Promise<void> {
  const db = getDb();
  const applied = await migrateToLatest(db);
  if (applied.length > 0) console.log(`Applied migrations: ${applied.join(', ')}`);
  await getLucia().deleteExpiredSessions();
  const filled = await backfillResultSummaries(db);
  if (filled > 0) console.log(`Made summaries and plot previews of ${filled} earlier result(s).`);
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

/** Stops the run scheduler: executing runs finish within the grace period or are put back in the queue. */
export async function shutdownServer(): Promise<void> {
  const requeued = await stopRunScheduler(shutdownGraceMs());
  if (requeued > 0) console.log(`Put ${requeued} executing run(s) back in the queue for the next start.`);
}

(globalThis as { [key: symbol]: unknown })[Symbol.for('quadrille.shutdown')] = shutdownServer;
