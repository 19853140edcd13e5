/**
 * Designed responses of the notebook's filter and decimate cells, computed in a worker a moment
 * after their parameters stop changing. Results are keyed by stage id; a result whose key no longer
 * matches the stage is kept on screen (greyed by the cell) until the new one arrives.
 */
import { useEffect, useRef, useState } from 'react';
import type { StagePropagation } from '@/dsp/chain/propagate';
import type { DraftDocument } from './draft';
import type { ResponseReply, ResponseRequest, ResponseResult } from './response-compute';

const RESPONSE_DEBOUNCE_MS = 120;

export interface StageResponse {
  result?: ResponseResult;
  error?: string;
  /** The key the stage has now; when it differs from result.key, a newer response is on its way. */
  key?: string;
}

/** Requests for every filter/decimate stage that can be designed (known input rate, not bypassed). */
export function responseRequests(doc: DraftDocument, propagation: StagePropagation[] | undefined): ResponseRequest[] {
  if (!propagation) return [];
  const out: ResponseRequest[] = [];
  doc.stages.forEach((stage, index) => {
    if (stage.kind !== 'filter' && stage.kind !== 'decimate') return;
    const p = propagation[index];
    // A stage with errors (bad parameters, an edge above Nyquist, an unstable design) has no response to draw.
    if (!p || p.stageId !== stage.id || p.issues.some((i) => i.severity === 'error')) return;
    const sampleRate = p.input.sampleRate;
    out.push({ key: `${stage.kind}|${sampleRate}|${JSON.stringify(stage.params)}`, stageId: stage.id, kind: stage.kind, params: stage.params, sampleRate });
  });
  return out;
}

/** Responses by stage id for the current document. */
export function useResponses(doc: DraftDocument, propagation: StagePropagation[] | undefined): Map<string, StageResponse> {
  const [responses, setResponses] = useState<Map<string, { result?: ResponseResult; error?: string }>>(new Map());
  const worker = useRef<Worker | null>(null);
  const sent = useRef(new Map<string, string>());
  const requests = responseRequests(doc, propagation);
  const signature = requests.map((r) => r.key + '#' + r.stageId).join('\n');

  useEffect(() => {
    const w = new Worker(new URL('./response.worker.ts', import.meta.url), { type: 'module' });
    worker.current = w;
    w.onmessage = (event: MessageEvent<ResponseReply>) => {
      const reply = event.data;
      setResponses((old) => {
        const next = new Map(old);
        if (reply.ok) next.set(reply.result.stageId, { result: reply.result });
        else next.set(reply.stageId, { ...old.get(reply.stageId), error: reply.message, result: undefined });
        return next;
      });
    };
    return () => {
      w.terminate();
      worker.current = null;
      sent.current.clear();
    };
  }, []);

  useEffect(() => {
    const timer = setTimeout(() => {
      for (const request of requests) {
        if (sent.current.get(request.stageId) === request.key) continue;
        sent.current.set(request.stageId, request.key);
        worker.current?.postMessage(request);
      }
    }, RESPONSE_DEBOUNCE_MS);
    return () => clearTimeout(timer);
    // The signature stands for the requests: same keys, same work.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [signature]);

  const out = new Map<string, StageResponse>();
  for (const request of requests) out.set(request.stageId, { ...responses.get(request.stageId), key: request.key });
  return out;
}
