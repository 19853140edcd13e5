/**
 * Run queue settings, read from the environment on each call (cheap) so tests and deployments set
 * them per process:
 *
 *   QUADRILLE_RUN_CONCURRENCY        runs executing at once in this server (default: cores - 1, at least 1)
 *   QUADRILLE_RUN_MAX_PENDING        queued + running runs one user may have (default 100)
 *   QUADRILLE_RUN_PROGRESS_MS        least time between two progress updates of a run (default 200 ms)
 *   QUADRILLE_RUN_CANCEL_GRACE_MS    time a cancelled worker gets to stop before it is terminated (default 1500 ms)
 *   QUADRILLE_RUN_NICE               nice value of run worker threads, 0..19 (default 19; Linux only)
 *   QUADRILLE_SSE_HEARTBEAT_MS       interval of the keep-alive comment on event streams (default 15000 ms)
 *   QUADRILLE_RUN_WORKER             path of the worker entry, overriding the built-in lookup
 */
import { availableParallelism } from 'node:os';

const env = process.env;

/** Error for a run setting that does not parse; names the variable. */
export class RunConfigError extends Error {
  constructor(readonly variable: string, problem: string) {
    super(`${variable} ${problem}`);
    this.name = 'RunConfigError';
  }
}

function readCount(variable: string, fallback: number, minimum: number): number {
  const text = (env[variable] ?? '').trim();
  if (!text) return fallback;
  const value = Number(text);
  if (!Number.isSafeInteger(value) || value < minimum) throw new RunConfigError(variable, `must be a whole number >= ${minimum}, got "${text}"`);
  return value;
}

/** Runs executing at once: QUADRILLE_RUN_CONCURRENCY, default one less than the cores (at least 1). */
export function runConcurrency(): number {
  return readCount('QUADRILLE_RUN_CONCURRENCY', Math.max(1, availableParallelism() - 1), 1);
}

/** Queued plus running runs one user may have before submissions answer 429 too_many_runs. */
export function maxPendingRuns(): number {
  return readCount('QUADRILLE_RUN_MAX_PENDING', 100, 1);
}

/** Least time (ms) between two progress updates of one run, in the worker, the database and the event stream. */
export function progressIntervalMs(): number {
  return readCount('QUADRILLE_RUN_PROGRESS_MS', 200, 10);
}

/** Time (ms) a cancelled worker gets to stop on its own before its thread is terminated. */
export function cancelGraceMs(): number {
  return readCount('QUADRILLE_RUN_CANCEL_GRACE_MS', 1500, 0);
}

/** Nice value of run worker threads (0..19): higher lets the web server's requests go first. */
export function workerNiceness(): number {
  const nice = readCount('QUADRILLE_RUN_NICE', 19, 0);
  if (nice > 19) throw new RunConfigError('QUADRILLE_RUN_NICE', `must be 0 to 19, got "${nice}"`);
  return nice;
}

/** Interval (ms) of the keep-alive comment on a run's event stream. */
export function heartbeatMs(): number {
  return readCount('QUADRILLE_SSE_HEARTBEAT_MS', 15_000, 100);
}

/** An explicit worker entry path (QUADRILLE_RUN_WORKER), or undefined. */
export function workerEntryOverride(): string | undefined {
  return (env.QUADRILLE_RUN_WORKER ?? '').trim() || undefined;
}
