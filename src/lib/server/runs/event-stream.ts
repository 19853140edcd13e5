/**
 * A run's server-sent event stream: `status` events ({ status, progress, currentStage, etaSeconds })
 * at most once per progress interval, a `done` event when the run ends, then the stream closes. A
 * comment line every heartbeat interval keeps proxies from dropping a quiet connection. The row is
 * re-read every few seconds as well, so a missed in-process notice only delays an update.
 */
import type { Knex } from 'knex';
import { heartbeatMs, progressIntervalMs } from './config';
import { subscribeRun } from './events';
import { estimateSecondsLeft } from './present';
import { findRun, finishedStatuses, flag, type RunView } from './rows';

const encoder = new TextEncoder();

function statusPayload(run: RunView) {
  const progress = Number(run.progress);
  return {
    status: run.status,
    progress,
    currentStage: run.current_stage,
    etaSeconds: run.status === 'running' ? estimateSecondsLeft(run.started_at, progress) : null,
  };
}

/** Re-read interval (ms) of the run row, the safety net under the in-process notices. */
const POLL_MS = 2000;

/** The event stream of run `runId` (already access-checked). */
export function runEventStream(db: Knex, runId: string, signal: AbortSignal): ReadableStream<Uint8Array> {
  let cleanup = () => {};
  return new ReadableStream<Uint8Array>({
    start(controller) {
      let closed = false;
      let lastSent = 0;
      let lastText = '';
      let pending: ReturnType<typeof setTimeout> | null = null;
      let reading = false;

      const write = (text: string) => {
        if (closed) return;
        try {
          controller.enqueue(encoder.encode(text));
        } catch {
          close();
        }
      };
      const close = () => {
        if (closed) return;
        closed = true;
        cleanup();
        try {
          controller.close();
        } catch {
          // Already closed by the client going away.
        }
      };
      const sendStatus = (run: RunView) => {
        const text = JSON.stringify(statusPayload(run));
        if (text === lastText) return;
        lastText = text;
        lastSent = Date.now();
        write(`event: status\ndata: ${text}\n\n`);
      };
      const refresh = async () => {
        if (closed || reading) return;
        reading = true;
        try {
          const run = await findRun(db, runId);
          if (!run) return close();
          if (finishedStatuses.has(run.status)) {
            sendStatus(run);
            write(`event: done\ndata: ${JSON.stringify({ status: run.status, fromCache: flag(run.from_cache) })}\n\n`);
            return close();
          }
          sendStatus(run);
        } catch {
          close();
        } finally {
          reading = false;
        }
      };
      // Notices can come hundreds of times a second across runs; send at most one per interval.
      const onNotice = () => {
        if (pending || closed) return;
        const wait = Math.max(0, lastSent + progressIntervalMs() - Date.now());
        pending = setTimeout(() => {
          pending = null;
          void refresh();
        }, wait);
      };
      const unsubscribe = subscribeRun(runId, onNotice);
      const heartbeat = setInterval(() => write(`: heartbeat ${new Date().toISOString()}\n\n`), heartbeatMs());
      const poll = setInterval(() => void refresh(), POLL_MS);
      const onAbort = () => close();
      signal.addEventListener('abort', onAbort);
      cleanup = () => {
        unsubscribe();
        clearInterval(heartbeat);
        clearInterval(poll);
        if (pending) clearTimeout(pending);
        signal.removeEventListener('abort', onAbort);
      };
      write(`retry: 2000\n\n`);
      void refresh();
    },
    cancel() {
      cleanup();
    },
  });
}
