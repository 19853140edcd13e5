/**
 * Web Worker of the quick look: the analysis of a 2^18-sample head takes a few hundred
 * milliseconds, which would freeze the page if it ran on the main thread.
 */
import { analyseHead, type QuickLookInput, type QuickLookResult } from './quicklook-analysis';

/** Answer of the worker: the result, or the message of what went wrong. */
export type QuickLookReply = { ok: true; result: QuickLookResult } | { ok: false; message: string };

self.onmessage = (event: MessageEvent<QuickLookInput>) => {
  let reply: QuickLookReply;
  try {
    reply = { ok: true, result: analyseHead(event.data) };
  } catch (error) {
    reply = { ok: false, message: error instanceof Error ? error.message : String(error) };
  }
  self.postMessage(reply);
};
