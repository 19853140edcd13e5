import { createHash, type Hash } from 'node:crypto';
import { Readable, Transform, type TransformCallback } from 'node:stream';
import { ObjectLengthMismatchError, ObjectTooLargeError } from './errors';
import type { ObjectSource, PutOptions } from './types';

/**
 * Pass-through stage every put runs its bytes through: counts them, hashes them with SHA-256 and
 * fails the stream as soon as the count passes `maxBytes` or `expectedBytes`. Failing inside the
 * stream (rather than checking afterwards) is what lets the quota stop a multi-GiB upload at
 * the limit instead of after the whole body arrived.
 */
export class ByteMeter extends Transform {
  private readonly hash: Hash = createHash('sha256');
  private count = 0;
  private digest: string | undefined;
  private readonly maxBytes: number | undefined;
  private readonly expectedBytes: number | undefined;

  constructor(options: Pick<PutOptions, 'maxBytes' | 'expectedBytes'> = {}) {
    super();
    this.maxBytes = options.maxBytes;
    this.expectedBytes = options.expectedBytes;
  }

  override _transform(chunk: Buffer | string, encoding: BufferEncoding, callback: TransformCallback): void {
    const bytes = typeof chunk === 'string' ? Buffer.from(chunk, encoding) : chunk;
    const next = this.count + bytes.length;
    if (this.maxBytes !== undefined && next > this.maxBytes) {
      callback(new ObjectTooLargeError(this.maxBytes, `the stream carried more than ${this.maxBytes} bytes`));
      return;
    }
    if (this.expectedBytes !== undefined && next > this.expectedBytes) {
      callback(new ObjectLengthMismatchError(this.expectedBytes, next));
      return;
    }
    this.count = next;
    this.hash.update(bytes);
    callback(null, bytes);
  }

  override _flush(callback: TransformCallback): void {
    if (this.expectedBytes !== undefined && this.count !== this.expectedBytes) {
      callback(new ObjectLengthMismatchError(this.expectedBytes, this.count));
      return;
    }
    this.digest = this.hash.digest('hex');
    callback();
  }

  /** Byte count and SHA-256 (hex); only valid once the stream has ended without error. */
  result(): { bytes: number; sha256: string } {
    if (this.digest === undefined) throw new Error('ByteMeter.result() called before the stream ended');
    return { bytes: this.count, sha256: this.digest };
  }
}

/** Checks put options before any byte moves, so an announced oversize body fails at once. */
export function checkPutOptions(options: PutOptions): void {
  const { maxBytes, expectedBytes } = options;
  if (maxBytes !== undefined && (!Number.isSafeInteger(maxBytes) || maxBytes < 0)) {
    throw new RangeError(`maxBytes must be a whole number of bytes >= 0, got ${maxBytes}`);
  }
  if (expectedBytes !== undefined && (!Number.isSafeInteger(expectedBytes) || expectedBytes < 0)) {
    throw new RangeError(`expectedBytes must be a whole number of bytes >= 0, got ${expectedBytes}`);
  }
  if (maxBytes !== undefined && expectedBytes !== undefined && expectedBytes > maxBytes) {
    throw new ObjectTooLargeError(maxBytes, `announced length is ${expectedBytes} bytes`);
  }
}

/** Any accepted source as a Node Readable (web streams come from `request.body` in endpoints). */
export function toReadable(source: ObjectSource): Readable {
  if (source instanceof Readable) return source;
  if (typeof (source as ReadableStream<Uint8Array>).getReader === 'function') {
    return Readable.fromWeb(source as Parameters<typeof Readable.fromWeb>[0]);
  }
  return Readable.from(source as AsyncIterable<Uint8Array>, { objectMode: false });
}
