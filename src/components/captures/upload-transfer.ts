/**
 * A resumable upload to /api/uploads with tus-js-client: retries after a dropped connection from
 * the offset the server confirms, resumes an upload interrupted by a closed tab (fingerprint kept
 * in localStorage), and on cancel terminates the upload so the server keeps nothing.
 */
import { Upload } from 'tus-js-client';

/** Where a transfer stands, for the progress bar. */
export interface TransferProgress {
  sent: number;
  total: number;
  /** Bytes per second over the last few seconds; null until measurable. */
  bytesPerSecond: number | null;
  /** Seconds left at the current rate; null until measurable. */
  secondsLeft: number | null;
  /** True while waiting to retry after a dropped connection. */
  retrying: boolean;
}

export interface TransferHandlers {
  onProgress: (progress: TransferProgress) => void;
  /** All bytes are stored; `uploadId` names the upload for GET /api/uploads/:id/capture. */
  onDone: (uploadId: string) => void;
  /** The upload failed for good: the server's status (0 without an answer) and its body. */
  onFailed: (status: number, body: string, message: string) => void;
}

export interface Transfer {
  /** Stops the transfer and deletes what the server holds of it. */
  cancel: () => Promise<void>;
}

/** Bytes sent per PATCH: a dropped connection costs at most this much of progress. */
const CHUNK_BYTES = 16 * 2 ** 20;
/** Window of the rate estimate (ms). */
const RATE_WINDOW_MS = 4000;

/** Fingerprint of a body and its description: the same file described differently is a new upload. */
function fingerprintOf(body: Blob, fileName: string, metadata: Record<string, string>): string {
  const file = body as Partial<File>;
  let hash = 0;
  for (const ch of JSON.stringify(metadata)) hash = (Math.imul(hash, 31) + ch.charCodeAt(0)) | 0;
  return ['quadrille-upload', fileName, body.size, file.lastModified ?? '', hash >>> 0].join('|');
}

/** Starts (or resumes) sending `body` with the tus metadata; reports through the handlers. */
export function startTransfer(body: Blob, fileName: string, metadata: Record<string, string>, handlers: TransferHandlers): Transfer {
  const samples: { t: number; bytes: number }[] = [];
  let retrying = false;
  const fingerprint = fingerprintOf(body, fileName, metadata);
  const upload = new Upload(body, {
    endpoint: '/api/uploads',
    metadata: { ...metadata, filename: fileName },
    chunkSize: CHUNK_BYTES,
    retryDelays: [0, 1000, 2000, 5000, 10000, 20000, 30000],
    storeFingerprintForResuming: true,
    removeFingerprintOnSuccess: true,
    fingerprint: () => Promise.resolve(fingerprint),
    onShouldRetry: (error, attempt, options) => {
      const status = error.originalResponse?.getStatus() ?? 0;
      // 4xx answers are the server's verdict (quota, bad metadata): retrying cannot change them.
      const transient = status === 0 || status === 409 || status === 423 || status >= 500;
      retrying = transient && attempt < (options.retryDelays?.length ?? 0);
      if (retrying) handlers.onProgress(progress(samples.at(-1)?.bytes ?? 0, body.size));
      return retrying;
    },
    onProgress: (sent, total) => {
      retrying = false;
      const now = performance.now();
      samples.push({ t: now, bytes: sent });
      while (samples.length > 2 && now - samples[0].t > RATE_WINDOW_MS) samples.shift();
      handlers.onProgress(progress(sent, total));
    },
    onSuccess: () => {
      const id = (upload.url ?? '').split('/').filter(Boolean).pop() ?? '';
      handlers.onDone(decodeURIComponent(id));
    },
    onError: (error) => {
      const response = (error as { originalResponse?: { getStatus(): number; getBody(): string } | null }).originalResponse;
      handlers.onFailed(response?.getStatus() ?? 0, response?.getBody() ?? '', error.message);
    },
  });

  function progress(sent: number, total: number): TransferProgress {
    const first = samples[0];
    const last = samples[samples.length - 1];
    const seconds = first && last ? (last.t - first.t) / 1000 : 0;
    const bytesPerSecond = seconds >= 0.5 ? (last.bytes - first.bytes) / seconds : null;
    const secondsLeft = bytesPerSecond && bytesPerSecond > 0 ? (total - sent) / bytesPerSecond : null;
    return { sent, total, bytesPerSecond, secondsLeft, retrying };
  }

  upload
    .findPreviousUploads()
    .then((previous) => {
      if (previous.length > 0) upload.resumeFromPreviousUpload(previous[0]);
      upload.start();
    })
    .catch(() => upload.start());

  return {
    cancel: async () => {
      try {
        await upload.abort(true);
      } catch {
        // The server may already have dropped it (expired, or never created): nothing is left either way.
      }
    },
  };
}
