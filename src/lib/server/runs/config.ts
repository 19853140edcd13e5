/**
 * Run queue settings: named views of the QUADRILLE_RUN_* / QUADRILLE_SSE_* variables of the one
 * configuration (src/lib/config/schema.ts holds their checks and defaults).
 */
import { config } from '../../config';

/** Runs executing at once: QUADRILLE_RUN_CONCURRENCY, default one less than the cores (at least 1). */
export function runConcurrency(): number {
  return config().QUADRILLE_RUN_CONCURRENCY;
}

/** Queued plus running runs one user may have before submissions answer 429 too_many_runs. */
export function maxPendingRuns(): number {
  return config().QUADRILLE_RUN_MAX_PENDING;
}

/** Least time (ms) between two progress updates of one run, in the worker, the database and the event stream. */
export function progressIntervalMs(): number {
  return config().QUADRILLE_RUN_PROGRESS_MS;
}

/** Time (ms) a cancelled worker gets to stop on its own before its thread is terminated. */
export function cancelGraceMs(): number {
  return config().QUADRILLE_RUN_CANCEL_GRACE_MS;
}

/** Time (ms) executing runs get to finish when the server is asked to stop, before they are put back in the queue. */
export function shutdownGraceMs(): number {
  return config().QUADRILLE_RUN_SHUTDOWN_GRACE_MS;
}

/** Heap cap (MiB) of a run worker's old generation: a runaway run fails alone instead of taking the server down. */
export function workerHeapMb(): number {
  return config().QUADRILLE_RUN_WORKER_HEAP_MB;
}

/** Nice value of run worker threads (0..19): higher lets the web server's requests go first. */
export function workerNiceness(): number {
  return config().QUADRILLE_RUN_NICE;
}

/** Interval (ms) of the keep-alive comment on a run's event stream. */
export function heartbeatMs(): number {
  return config().QUADRILLE_SSE_HEARTBEAT_MS;
}

/** An explicit worker entry path (QUADRILLE_RUN_WORKER), or undefined. */
export function workerEntryOverride(): string | undefined {
  return config().QUADRILLE_RUN_WORKER;
}
