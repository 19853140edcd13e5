/**
 * Starting a run worker thread and turning its messages into one outcome. Where the worker entry
 * is: the built server (dist/server/entry.mjs) finds dist/workers/run-worker.mjs beside it (built
 * by scripts/build-workers.mjs); elsewhere (astro dev) the TypeScript source runs through tsx.
 */
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { cancelGraceMs, workerEntryOverride, workerHeapMb } from './config';
import type { RunJob, SchedulerMessage, WorkerMessage, WorkerOutcome } from './protocol';

interface WorkerEntry {
  /** A module path, or (from source) the code that loads it through tsx. */
  code: string;
  eval: boolean;
}

/** A built module runs as is. */
function builtEntry(path: string): WorkerEntry {
  return { code: path, eval: false };
}

/**
 * TypeScript source runs through tsx's register API: a worker's --import flag does not reach its
 * own entry on Node 20, so a small loader registers tsx first and then imports the entry.
 */
function sourceEntry(path: string): WorkerEntry {
  const url = JSON.stringify(pathToFileURL(path).href);
  return { code: `import('tsx/esm/api').then((tsx) => { tsx.register(); return import(${url}); });`, eval: true };
}

let cachedEntry: WorkerEntry | null = null;

/** The worker entry this process should start; throws naming the paths it tried. */
export function workerEntry(): WorkerEntry {
  if (cachedEntry) return cachedEntry;
  const override = workerEntryOverride();
  const builtBesideServer = resolve(dirname(process.argv[1] ?? '.'), '../workers/run-worker.mjs');
  const source = resolve('workers/run-worker.ts');
  if (override) cachedEntry = override.endsWith('.ts') ? sourceEntry(resolve(override)) : builtEntry(resolve(override));
  else if (existsSync(builtBesideServer)) cachedEntry = builtEntry(builtBesideServer);
  else if (existsSync(source)) cachedEntry = sourceEntry(source);
  else throw new Error(`run worker entry not found: looked for ${builtBesideServer} and ${source}; run \`npm run build\``);
  return cachedEntry;
}

/** A run executing in a worker thread. */
export interface WorkerRun {
  /** The final message; a thread that dies without one answers `failed` (or `cancelled` after a cancel). */
  outcome: Promise<WorkerOutcome>;
  /** Asks the worker to stop; terminates the thread if it has not stopped within the grace time. */
  cancel(): void;
}

/** Starts `job` in a fresh worker thread; progress messages go to `onProgress`. */
export function startWorker(job: RunJob, onProgress: (message: Extract<WorkerMessage, { type: 'progress' }>) => void): WorkerRun {
  const entry = workerEntry();
  const started = performance.now();
  const worker = new Worker(entry.code, {
    workerData: job,
    eval: entry.eval,
    // A run that outgrows its heap fails with an out-of-memory error instead of swelling the server.
    resourceLimits: { maxOldGenerationSizeMb: workerHeapMb() },
  });
  let cancelled = false;
  let settled = false;
  let settle!: (message: WorkerOutcome) => void;
  const outcome = new Promise<WorkerOutcome>((resolveOutcome) => {
    settle = (message) => {
      if (settled) return;
      settled = true;
      resolveOutcome(message);
      // The worker has said its last word; its thread only holds resources now.
      void worker.terminate();
    };
  });
  const seconds = () => (performance.now() - started) / 1000;
  worker.on('message', (message: WorkerMessage) => {
    if (message.type === 'progress') {
      if (!settled) onProgress(message);
      return;
    }
    settle(message);
  });
  worker.on('error', (error) => {
    settle(cancelled ? { type: 'cancelled', seconds: seconds() } : { type: 'failed', error: { message: `run worker crashed: ${error.message}`, stageId: null, kind: 'internal', sampleIndex: null }, seconds: seconds() });
  });
  worker.on('exit', (code) => {
    settle(cancelled ? { type: 'cancelled', seconds: seconds() } : { type: 'failed', error: { message: `run worker stopped unexpectedly (exit code ${code})`, stageId: null, kind: 'internal', sampleIndex: null }, seconds: seconds() });
  });
  return {
    outcome,
    cancel() {
      if (settled || cancelled) return;
      cancelled = true;
      worker.postMessage({ type: 'cancel' } satisfies SchedulerMessage);
      const timer = setTimeout(() => {
        if (!settled) void worker.terminate();
      }, cancelGraceMs());
      timer.unref();
    },
  };
}
