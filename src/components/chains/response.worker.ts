/**
 * Web Worker that designs filters and computes their responses for the notebook's plots. Requests
 * that arrive while one is computed replace older ones for the same stage, so a burst of edits
 * costs one design per stage, not one per keystroke.
 */
import { computeResponse, type ResponseReply, type ResponseRequest } from './response-compute';

const pending = new Map<string, ResponseRequest>();
let scheduled = false;

function schedule(): void {
  if (scheduled) return;
  scheduled = true;
  // One design per task: messages that arrived meanwhile are taken in before the next one.
  setTimeout(drain, 0);
}

function drain(): void {
  scheduled = false;
  const next = pending.entries().next();
  if (next.done) return;
  const [stageId, request] = next.value;
  pending.delete(stageId);
  let reply: ResponseReply;
  try {
    reply = { ok: true, result: computeResponse(request) };
  } catch (error) {
    reply = { ok: false, key: request.key, stageId: request.stageId, message: error instanceof Error ? error.message : String(error) };
  }
  self.postMessage(reply);
  if (pending.size > 0) schedule();
}

self.onmessage = (event: MessageEvent<ResponseRequest>) => {
  pending.delete(event.data.stageId);
  pending.set(event.data.stageId, event.data);
  schedule();
};
