import { createHash, type Hash } from 'node:crypto';
import { Readable, Transform, type TransformCallback } from 'node:stream';
import { ObjectLengthMismatchError, ObjectTooLargeError } from './errors';
import type { ObjectSource, PutOptions } from './types';

/**
 * Counts and hashes (SHA-256) the bytes of one put and fails as soon as the count passes
 * `maxBytes` or `expectedBytes`. Failing on the way (rather than checking afterwards) is what
 * lets the quota stop a multi-GiB upload at the limit instead of after the whole body arrived.
 */
export class ByteTally {
  private readonly hash: Hash = createHash('sha256');
  private count = 0;
  private digest: string | undefined;
  private readonly maxBytes: number | undefined;
  private readonly expectedBytes: number | undefined;

  constructor(options: Pick<PutOptions, 'maxBytes' | 'expectedBytes'> = {}) {
    this.maxBytes = options.maxBytes;
    this.expectedBytes = options.expectedBytes;
  }

  /** Takes the next bytes; throws ObjectTooLargeError / ObjectLengthMismatchError past a limit. */
  add(bytes: Uint8Array): void {
    const next = this.count + bytes.byteLength;
    if (this.maxBytes !== undefined && next > this.maxBytes) {
      throw new ObjectTooLargeError(this.maxBytes, `the stream carried more than ${this.maxBytes} bytes`);
    }
    if (this.expectedBytes !== undefined && next > this.expectedBytes) {
      throw new ObjectLengthMismatchError(this.expectedBytes, next);
    }
    this.count = next;
    this.hash.update(bytes);
  }

  /** Ends the count; throws ObjectLengthMismatchError when fewer bytes than announced came. */
  finish(): void {
    if (this.expectedBytes !== undefined && this.count !== this.expectedBytes) {
      throw new ObjectLengthMismatchError(this.expectedBytes, this.count);
    }
    this.digest = this.hash.digest('hex');
  }

  /** Byte count and SHA-256 (hex); only valid after `finish()`. */
  result(): { bytes: number; sha256: string } {
    if (this.digest === undefined) throw new Error('ByteTally.result() called before finish()');
    return { bytes: this.count, sha256: this.digest };
  }
}

/** ByteTally as a pass-through stream stage, for backends that consume a Node stream (S3). */
export class ByteMeter extends Transform {
  private readonly tally: ByteTally;

  constructor(options: Pick<PutOptions, 'maxBytes' | 'expectedBytes'> = {}) {
    super();
    this.tally = new ByteTally(options);
  }

  override _transform(chunk: Buffer | string, encoding: BufferEncoding, callback: TransformCallback): void {
    const bytes = typeof chunk === 'string' ? Buffer.from(chunk, encoding) : chunk;
    try {
      this.tally.add(bytes);
    } catch (error) {
      callback(error as Error);
      return;
    }
    callback(null, bytes);
  }

  override _flush(callback: TransformCallback): void {
    try {
      this.tally.finish();
    } catch (error) {
      callback(error as Error);
      return;
    }
    callback();
  }

  /** Byte count and SHA-256 (hex); only valid once the stream has ended without error. */
  result(): { bytes: number; sha256: string } {
    return this.tally.result();
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

/** Any accepted source as an async iterable of byte chunks (Node streams, web streams and iterables all iterate). */
export function chunksOf(source: ObjectSource): AsyncIterable<Uint8Array> {
  if (typeof (source as AsyncIterable<Uint8Array>)[Symbol.asyncIterator] === 'function') return source as AsyncIterable<Uint8Array>;
  return Readable.fromWeb(source as Parameters<typeof Readable.fromWeb>[0]);
}

/** Any accepted source as a Node Readable (web streams come from `request.body` in endpoints). */
export function toReadable(source: ObjectSource, highWaterMark?: number): Readable {
  if (source instanceof Readable) return source;
  if (typeof (source as ReadableStream<Uint8Array>).getReader === 'function') {
    return Readable.fromWeb(source as Parameters<typeof Readable.fromWeb>[0]);
  }
  return Readable.from(source as AsyncIterable<Uint8Array>, { objectMode: false, ...(highWaterMark ? { highWaterMark } : {}) });
}
