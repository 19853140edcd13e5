/**
 * The generic run worker: a worker thread that executes one run job (workerData) and reports
 * progress and its outcome to the scheduler. A `cancel` message aborts the chain run, which stops
 * within one block; the scheduler terminates the thread after the final message.
 *
 * Built to dist/workers/run-worker.mjs by scripts/build-workers.mjs (the built server has no
 * TypeScript loader); under `astro dev` the scheduler loads this file through tsx.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { createObjectStore } from '@/lib/server/storage';
import type { RunJob, SchedulerMessage, WorkerMessage } from '@/lib/server/runs/protocol';
import { executeRun } from './execute-run';
import { niceThisThread } from './thread-priority';

if (!parentPort) throw new Error('run-worker must be started as a worker thread');
const port = parentPort;
// Runs are background work: the web server's main thread must stay quick while they execute.
niceThisThread((workerData as RunJob).niceness);
const controller = new AbortController();

port.on('message', (message: SchedulerMessage) => {
  if (message.type === 'cancel') controller.abort(new Error('cancelled by request'));
});

const post = (message: WorkerMessage) => port.postMessage(message);
const outcome = await executeRun(workerData as RunJob, createObjectStore(), { signal: controller.signal, onProgress: post });
post(outcome);
