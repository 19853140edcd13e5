/**
 * Web Worker of the notebook's preview: fetches the head of a capture once (a Range request),
 * keeps it decoded, and runs the chain on it after every edit. A newer run cancels an older one,
 * so typing in the page never waits for a run.
 */
import { parseDatatype } from '../../dsp/formats/datatype';
import { SampleDecoder } from '../../dsp/formats/sample-decoder';
import { isAbortError, ChainRunError } from '../../dsp/chain/run-error';
import { streamFormatOf, type PreviewCapture } from '../../contracts/capture';
import { PREVIEW_HEAD_SAMPLES, previewOnHead, type PreviewReply, type PreviewRequest } from './preview-protocol';

const heads = new Map<string, Promise<Float32Array>>();
let current: { runId: number; controller: AbortController } | null = null;

/** Decoded head of a capture, fetched once per capture (the two most recent are kept). */
function headOf(capture: PreviewCapture): Promise<Float32Array> {
  const cached = heads.get(capture.id);
  if (cached) return cached;
  const loading = fetchHead(capture);
  heads.set(capture.id, loading);
  loading.catch(() => heads.delete(capture.id));
  while (heads.size > 2) heads.delete(heads.keys().next().value as string);
  return loading;
}

async function fetchHead(capture: PreviewCapture): Promise<Float32Array> {
  const samples = Math.min(PREVIEW_HEAD_SAMPLES, capture.sampleCount);
  const bytes = samples * capture.bytesPerSample;
  const response = await fetch(`/api/captures/${encodeURIComponent(capture.id)}/data`, {
    headers: { Range: `bytes=0-${bytes - 1}` },
    credentials: 'same-origin',
  });
  if (!response.ok) throw new Error(`the capture's samples could not be read (the server answered ${response.status})`);
  // A server that ignores Range sends the whole file: only the head is kept.
  const body = new Uint8Array(await response.arrayBuffer()).subarray(0, bytes);
  const decoder = new SampleDecoder(parseDatatype(capture.datatype), capture.layout);
  return decoder.decode(body);
}

async function run(request: Extract<PreviewRequest, { type: 'run' }>): Promise<void> {
  current?.controller.abort();
  const controller = new AbortController();
  current = { runId: request.runId, controller };
  const started = performance.now();
  let reply: PreviewReply;
  try {
    const head = await headOf(request.capture);
    const fetched = performance.now();
    if (controller.signal.aborted) return;
    const { capture } = request;
    const result = await previewOnHead(request.document, streamFormatOf(capture), head, controller.signal);
    reply = { type: 'result', runId: request.runId, ...result, sampleRate: capture.sampleRate, fetchMs: fetched - started, runMs: performance.now() - fetched };
  } catch (error) {
    if (isAbortError(error)) return;
    reply = {
      type: 'error',
      runId: request.runId,
      message: error instanceof Error ? error.message : String(error),
      ...(error instanceof ChainRunError && error.stageId ? { stageId: error.stageId } : {}),
    };
  }
  if (current?.runId === request.runId) current = null;
  self.postMessage(reply);
}

self.onmessage = (event: MessageEvent<PreviewRequest>) => {
  const request = event.data;
  if (request.type === 'cancel') {
    if (current?.runId === request.runId) current.controller.abort();
    return;
  }
  void run(request);
};
