import { useEffect, useState } from 'react';
import { fetchHead } from './head-request';
import { QUICK_LOOK_SAMPLES, type QuickLookInput, type QuickLookResult } from './quicklook-analysis';
import type { QuickLookReply } from './quicklook.worker';
import type { Capture } from './types';

/** Where the quick look stands: reading the head, analysing it, done, or failed with a message. */
export type QuickLookState =
  | { phase: 'reading' | 'analysing'; headSamples: number }
  | { phase: 'done'; headSamples: number; result: QuickLookResult; readMs: number }
  | { phase: 'failed'; headSamples: number; message: string };

type QuickLookCapture = Pick<Capture, 'id' | 'datatype' | 'layout' | 'sampleRate' | 'sampleCount' | 'bytesPerSample'>;

/** Reads the head of a capture and analyses it in a Web Worker; the page stays responsive meanwhile. */
export function useQuickLook(capture: QuickLookCapture): QuickLookState {
  const headSamples = Math.min(QUICK_LOOK_SAMPLES, capture.sampleCount);
  const [state, setState] = useState<QuickLookState>({ phase: 'reading', headSamples });

  useEffect(() => {
    const abort = new AbortController();
    let worker: Worker | null = null;
    setState({ phase: 'reading', headSamples });
    (async () => {
      const started = performance.now();
      const bytes = await fetchHead(capture.id, headSamples, capture.bytesPerSample, abort.signal);
      const readMs = performance.now() - started;
      if (abort.signal.aborted) return;
      setState({ phase: 'analysing', headSamples });
      worker = new Worker(new URL('./quicklook.worker.ts', import.meta.url), { type: 'module' });
      const reply = await new Promise<QuickLookReply>((resolve) => {
        worker!.onmessage = (event: MessageEvent<QuickLookReply>) => resolve(event.data);
        worker!.onerror = (event) => resolve({ ok: false, message: event.message || 'The analysis worker failed to start.' });
        const input: QuickLookInput = { bytes, datatype: capture.datatype, layout: capture.layout, sampleRate: capture.sampleRate };
        worker!.postMessage(input, [bytes]);
      });
      if (abort.signal.aborted) return;
      setState(reply.ok ? { phase: 'done', headSamples, result: reply.result, readMs } : { phase: 'failed', headSamples, message: reply.message });
    })().catch((error: unknown) => {
      if (abort.signal.aborted) return;
      setState({ phase: 'failed', headSamples, message: error instanceof Error ? error.message : String(error) });
    });
    return () => {
      abort.abort();
      worker?.terminate();
    };
  }, [capture.id, capture.datatype, capture.layout, capture.sampleRate, capture.bytesPerSample, headSamples]);

  return state;
}
