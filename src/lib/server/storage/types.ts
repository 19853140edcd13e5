import type { Readable } from 'node:stream';

/**
 * Bytes fed to `put`: a Node stream, a web ReadableStream (an endpoint's `request.body`) or any
 * async iterable of chunks. The store pulls from it with back-pressure, so a slow disk or a slow
 * S3 part upload slows the sender instead of growing server memory.
 */
export type ObjectSource = Readable | ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>;

/** Options of `put`. */
export interface PutOptions {
  /** Largest accepted object in bytes; the put stops with ObjectTooLargeError past it (the storage quota). */
  maxBytes?: number;
  /** Announced length in bytes (e.g. Content-Length); any other count fails with ObjectLengthMismatchError. */
  expectedBytes?: number;
  /** Cancels the put (client went away, upload cancelled); fails with StorageAbortedError. */
  signal?: AbortSignal;
  /** MIME type recorded with the object where the backend keeps one (S3). */
  contentType?: string;
}

/** What a completed put wrote: computed while streaming, never by reading the object back. */
export interface PutResult {
  key: string;
  /** Bytes stored. */
  bytes: number;
  /** SHA-256 of the stored bytes, lowercase hex. */
  sha256: string;
}

/** Inclusive byte range, like HTTP `Range: bytes=start-end`; `end` past the object is clipped. */
export interface ByteRange {
  start: number;
  end?: number;
}

/** Size and key of a stored object. */
export interface ObjectInfo {
  key: string;
  /** Object size in bytes. */
  size: number;
}

/** A readable view on (part of) an object. The caller must consume or destroy `stream`. */
export interface ObjectRead {
  stream: Readable;
  /** Whole object size in bytes (for Content-Range). */
  size: number;
  /** First byte delivered (inclusive). */
  start: number;
  /** Last byte delivered (inclusive); start - 1 for an empty object read whole. */
  end: number;
  /** Bytes the stream delivers: end - start + 1. */
  length: number;
}

/**
 * Where capture sample data lives. Keys are slash-separated names such as
 * `captures/<id>/data`; a key is meant to be written once (the caller picks a fresh one per
 * upload), which is what makes "a failed put leaves nothing" hold on every backend.
 */
export interface ObjectStore {
  /** Which backend this is, for logs and the admin page. */
  readonly kind: 'local' | 's3';
  /**
   * Streams `source` into the object `key`, computing byte count and SHA-256 on the way. The
   * object becomes visible only when complete; on any failure (source error, limit, abort,
   * backend error) nothing is left under `key`.
   */
  put(key: string, source: ObjectSource, options?: PutOptions): Promise<PutResult>;
  /** Opens the object (or an inclusive byte range of it) for reading; ObjectNotFoundError if absent. */
  get(key: string, range?: ByteRange): Promise<ObjectRead>;
  /** Size of the object; ObjectNotFoundError if absent. */
  head(key: string): Promise<ObjectInfo>;
  /** True when an object is stored under `key`. */
  exists(key: string): Promise<boolean>;
  /** Removes the object; removing an absent object is not an error (idempotent, like S3). */
  delete(key: string): Promise<void>;
  /** Objects whose key starts with `prefix`, in key order. */
  list(prefix?: string): AsyncIterable<ObjectInfo>;
}
