/**
 * In-process notices of run changes (status, progress), for the event streams. One server process
 * runs the queue, so a process-wide emitter reaches every listener; streams also re-read the row now
 * and then, so a missed notice only delays an update.
 */
import { EventEmitter } from 'node:events';

/** What changed in a run, as the event stream sends it. */
export interface RunNotice {
  runId: string;
  status: string;
  /** 0..1. */
  progress: number;
  currentStage: string | null;
}

const key = Symbol.for('quadrille.runEvents');
type Holder = { [key]?: EventEmitter };

function emitter(): EventEmitter {
  const holder = globalThis as Holder;
  if (!holder[key]) {
    holder[key] = new EventEmitter();
    // Every open event stream listens; there is no fixed bound on how many are open.
    holder[key].setMaxListeners(0);
  }
  return holder[key];
}

/** Tells listeners of `notice.runId` that the run changed. */
export function publishRunNotice(notice: RunNotice): void {
  emitter().emit(notice.runId, notice);
}

/** Listens to changes of one run; returns the function that stops listening. */
export function subscribeRun(runId: string, listener: (notice: RunNotice) => void): () => void {
  emitter().on(runId, listener);
  return () => emitter().off(runId, listener);
}
