/**
 * The request body as a chunk source for the capture command, read through its own reader so
 * that stopping early never cancels the body: cancelling would destroy the socket and the client
 * would see a reset instead of our 4xx. After a refusal the rest of the body is read and thrown
 * away in the background (bounded), then the connection is dropped.
 */
import type { ChunkSource } from './ingest';

/** Bytes a refused upload may still send before the connection is dropped. */
const DRAIN_LIMIT_BYTES = 256 * 1024 * 1024;
/** Time a refused upload may keep sending (ms). */
const DRAIN_LIMIT_MS = 30_000;

export interface RequestBody {
  source: ChunkSource;
  /** Call after a refusal: keeps reading (and discarding) for a while so the client can read the answer. */
  abandon(): void;
}

/** Wraps `request.body` (an empty body reads as no chunks). */
export function requestBody(request: Request): RequestBody {
  const reader = request.body?.getReader() ?? null;
  let finished = reader === null;
  const source: ChunkSource = {
    async next() {
      if (finished || !reader) return { done: true, value: undefined };
      const result = await reader.read();
      if (result.done) {
        finished = true;
        return { done: true, value: undefined };
      }
      return { done: false, value: result.value };
    },
  };
  return {
    source,
    abandon() {
      if (finished || !reader) return;
      finished = true;
      void drain(reader);
    },
  };
}

async function drain(reader: ReadableStreamDefaultReader<Uint8Array>): Promise<void> {
  const deadline = Date.now() + DRAIN_LIMIT_MS;
  let discarded = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      discarded += value.byteLength;
      if (discarded > DRAIN_LIMIT_BYTES || Date.now() > deadline) {
        await reader.cancel();
        return;
      }
    }
  } catch {
    // The client went away: nothing left to drain.
  }
}
