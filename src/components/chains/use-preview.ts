/**
 * The preview of a chain on the head of a capture: after an edit settles (a quarter second), the
 * valid document goes to the preview worker; a newer edit cancels the run in progress. Reports
 * how long the result took from the edit that caused it.
 */
import { useEffect, useRef, useState } from 'react';
import type { ChainDocument } from '@/dsp/chain/document';
import type { PreviewCapture } from '@/contracts/capture';
import type { PreviewProbe, PreviewReply } from './preview-protocol';

/** Quiet time after an edit before the preview runs (ms). */
export const PREVIEW_DEBOUNCE_MS = 250;

export interface PreviewState {
  status: 'idle' | 'waiting' | 'running' | 'done' | 'error';
  probes: Map<string, PreviewProbe>;
  /** Samples the last result was computed on. */
  samples?: number;
  sampleRate?: number;
  /** From the edit to the result on screen (ms): debounce, fetch (first time only) and run. */
  editToResultMs?: number;
  /** Whether the result answers an edit (false for the first preview after opening or a capture change). */
  afterEdit?: boolean;
  runMs?: number;
  fetchMs?: number;
  error?: { message: string; stageId?: string };
  /** Whether the probes shown belong to an older version of the document. */
  stale: boolean;
  /** Results received so far, so a watcher can tell a new result from the previous one. */
  results: number;
}

/** Runs `document` (a valid one, or null when the document has errors) on `capture`'s head. */
export function usePreview(document: ChainDocument | null, capture: PreviewCapture | null, editedAt: number): PreviewState {
  const [state, setState] = useState<PreviewState>({ status: 'idle', probes: new Map(), stale: false, results: 0 });
  const worker = useRef<Worker | null>(null);
  const runId = useRef(0);
  const lastRunAt = useRef(0);
  const editTimes = useRef(new Map<number, { time: number; afterEdit: boolean }>());
  const documentJson = document ? JSON.stringify(document) : null;

  useEffect(() => {
    const w = new Worker(new URL('./preview.worker.ts', import.meta.url), { type: 'module' });
    worker.current = w;
    w.onmessage = (event: MessageEvent<PreviewReply>) => {
      const reply = event.data;
      if (reply.runId !== runId.current) return;
      const editTime = editTimes.current.get(reply.runId);
      editTimes.current.clear();
      if (reply.type === 'error') {
        setState((old) => ({ ...old, status: 'error', error: { message: reply.message, stageId: reply.stageId }, stale: true }));
        return;
      }
      setState((old) => ({
        results: old.results + 1,
        status: 'done',
        probes: new Map(reply.probes.map((p) => [p.stageId, p])),
        samples: reply.samplesIn,
        sampleRate: reply.sampleRate,
        editToResultMs: editTime !== undefined ? performance.now() - editTime.time : undefined,
        afterEdit: editTime?.afterEdit,
        runMs: reply.runMs,
        fetchMs: reply.fetchMs,
        stale: false,
      }));
    };
    return () => {
      w.terminate();
      worker.current = null;
    };
  }, []);

  useEffect(() => {
    if (!documentJson || !capture) {
      runId.current++;
      setState((old) => ({ ...old, status: 'idle', stale: old.probes.size > 0 }));
      return;
    }
    setState((old) => ({ ...old, status: 'waiting', stale: old.probes.size > 0 }));
    const timer = setTimeout(() => {
      const id = ++runId.current;
      // The first run after opening has no edit to time from: it counts from when it was sent.
      const afterEdit = editedAt > lastRunAt.current;
      lastRunAt.current = performance.now();
      editTimes.current.set(id, { time: afterEdit ? editedAt : performance.now(), afterEdit });
      setState((old) => ({ ...old, status: 'running' }));
      worker.current?.postMessage({ type: 'run', runId: id, document: JSON.parse(documentJson), capture });
    }, PREVIEW_DEBOUNCE_MS);
    return () => {
      clearTimeout(timer);
      worker.current?.postMessage({ type: 'cancel', runId: runId.current });
    };
    // editedAt travels with the document it belongs to.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [documentJson, capture?.id]);

  return state;
}
