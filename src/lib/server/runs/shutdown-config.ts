/**
 * Settings of the run scheduler's shutdown and of worker memory (a small file of its own while the
 * config modules are being merged into one schema):
 *
 *   QUADRILLE_RUN_SHUTDOWN_GRACE_MS   time executing runs get to finish on SIGTERM/SIGINT before they
 *                                     are stopped and put back in the queue (default 10000 ms)
 *   QUADRILLE_RUN_WORKER_HEAP_MB      old-generation heap cap of one run worker thread (default 1536 MiB)
 */

function readWhole(variable: string, fallback: number, min: number): number {
  const text = (process.env[variable] ?? '').trim();
  if (!text) return fallback;
  const value = Number(text);
  if (!Number.isSafeInteger(value) || value < min) throw new Error(`${variable} must be a whole number >= ${min}, got "${text}"`);
  return value;
}

/** Time (ms) executing runs get to finish when the server is asked to stop. */
export function shutdownGraceMs(): number {
  return readWhole('QUADRILLE_RUN_SHUTDOWN_GRACE_MS', 10_000, 0);
}

/** Heap cap (MiB) of a run worker's old generation: a runaway run fails alone instead of taking the server down. */
export function workerHeapMb(): number {
  return readWhole('QUADRILLE_RUN_WORKER_HEAP_MB', 1536, 64);
}
