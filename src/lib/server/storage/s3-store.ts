import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  S3Client,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { pipeline, Readable } from 'node:stream';
import { ByteMeter, checkPutOptions, toReadable } from './byte-meter';
import { ObjectNotFoundError, RangeNotSatisfiableError, StorageAbortedError, StorageError, existsByHead } from './errors';
import { assertKeyPrefix, assertObjectKey, resolveRange } from './keys';
import type { ByteRange, ObjectInfo, ObjectRead, ObjectSource, ObjectStore, PutOptions, PutResult } from './types';

const MiB = 1024 * 1024;
/** Bytes read ahead of the multipart uploader from a source that is not already a stream. */
const READ_AHEAD_BYTES = 4 * MiB;
/** S3 refuses multipart uploads of more parts than this. */
const MAX_PARTS = 10_000;

/** Connection settings of an S3-compatible service. */
export interface S3ConnectionConfig {
  region: string;
  /** Base URL of a non-AWS service (e.g. `http://127.0.0.1:9000`); absent means AWS itself. */
  endpoint?: string;
  accessKeyId?: string;
  secretAccessKey?: string;
  /** `bucket` in the path instead of the host name; most self-hosted services need it. */
  forcePathStyle?: boolean;
}

/** Builds the SDK client with settings that S3-compatible services (and the test fake) accept. */
export function createS3Client(config: S3ConnectionConfig): S3Client {
  return new S3Client({
    region: config.region,
    endpoint: config.endpoint,
    forcePathStyle: config.forcePathStyle ?? false,
    // Without explicit keys the SDK's default chain applies (AWS_* variables, profile, instance role).
    credentials:
      config.accessKeyId && config.secretAccessKey
        ? { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey }
        : undefined,
    // Recent SDKs add CRC32 trailers in aws-chunked bodies by default, which many S3-compatible
    // servers reject; the store computes its own SHA-256 on the way, so ask only where required.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
}

/** Options of S3Store. */
export interface S3StoreOptions {
  client: S3Client;
  bucket: string;
  /**
   * Multipart part size in bytes (>= 5 MiB, default 8 MiB). The SDK's uploader assembles each
   * part by concatenating chunks, so a put holds roughly (queueSize + 3.5) parts at its peak
   * (measured with tests/storage/measure-put-memory.ts).
   */
  partSize?: number;
  /** Parts uploaded in parallel per put (default 2: keeps a put near 60 MiB; raise for long-haul links). */
  queueSize?: number;
}

/**
 * Objects in one bucket of an S3-compatible service. A put streams through the SDK's multipart
 * uploader in parts of a few MiB (memory stays flat for multi-GiB captures); any failure aborts
 * the multipart upload, so no object appears. Set a bucket lifecycle rule that aborts incomplete
 * multipart uploads after a day as a second line for crashes mid-upload.
 */
export class S3Store implements ObjectStore {
  readonly kind = 's3' as const;
  readonly bucket: string;
  private readonly client: S3Client;
  private readonly partSize: number;
  private readonly queueSize: number;

  constructor(options: S3StoreOptions) {
    this.client = options.client;
    this.bucket = options.bucket;
    this.partSize = options.partSize ?? 8 * MiB;
    this.queueSize = options.queueSize ?? 2;
    if (!Number.isSafeInteger(this.partSize) || this.partSize < 5 * MiB) {
      throw new RangeError(`partSize must be at least 5 MiB (S3 minimum), got ${this.partSize} bytes`);
    }
    if (!Number.isSafeInteger(this.queueSize) || this.queueSize < 1) {
      throw new RangeError(`queueSize must be a whole number >= 1, got ${this.queueSize}`);
    }
  }

  /** Streams the source through a multipart upload, hashing and counting on the way. */
  async put(key: string, source: ObjectSource, options: PutOptions = {}): Promise<PutResult> {
    assertObjectKey(key);
    checkPutOptions(options);
    const { signal } = options;
    if (signal?.aborted) throw new StorageAbortedError(signal.reason);

    // Reading ahead of the uploader lets the next bytes arrive while a part is being sent,
    // instead of the two taking turns chunk by chunk.
    const input = toReadable(source, READ_AHEAD_BYTES);
    const meter = new ByteMeter(options);
    // The first failure of the byte stream (source error, limit, abort) is the one to report:
    // the uploader may replace it with a later error of its own clean-up.
    let streamFailure: unknown;
    meter.on('error', (error) => {
      streamFailure ??= error;
    });
    pipeline(input, meter, () => undefined);
    const onAbort = () => meter.destroy(new StorageAbortedError(signal?.reason));
    signal?.addEventListener('abort', onAbort, { once: true });

    const upload = new Upload({
      client: this.client,
      params: { Bucket: this.bucket, Key: key, Body: meter, ContentType: options.contentType },
      partSize: this.partSizeFor(options),
      queueSize: this.queueSize,
      leavePartsOnError: false,
    });
    try {
      await upload.done();
    } catch (error) {
      input.destroy();
      meter.destroy();
      if (streamFailure !== undefined) throw streamFailure;
      throw new StorageError('backend_failed', `S3 upload of "${key}" failed: ${describe(error)}`, { cause: error });
    } finally {
      signal?.removeEventListener('abort', onAbort);
    }
    if (signal?.aborted) {
      // The last part was already on its way when the abort came: take the object back out.
      await this.delete(key);
      throw new StorageAbortedError(signal.reason);
    }
    return { key, ...meter.result() };
  }

  /** Ranged GetObject; the reported size comes from Content-Range, so one request suffices. */
  async get(key: string, range?: ByteRange): Promise<ObjectRead> {
    assertObjectKey(key);
    if (range) resolveRange(range, Number.MAX_SAFE_INTEGER); // argument checks only
    let response;
    try {
      response = await this.client.send(
        new GetObjectCommand({
          Bucket: this.bucket,
          Key: key,
          Range: range ? `bytes=${range.start}-${range.end ?? ''}` : undefined,
        }),
      );
    } catch (error) {
      if (isNotFound(error)) throw new ObjectNotFoundError(key, { cause: error });
      if (statusOf(error) === 416 && range) {
        const { size } = await this.head(key);
        resolveRange(range, size);
        throw new RangeNotSatisfiableError(range.start, range.end ?? size - 1, size);
      }
      throw error;
    }
    const stream = response.Body as Readable | undefined;
    const length = response.ContentLength ?? 0;
    const parsed = parseContentRange(response.ContentRange);
    if (parsed) return { stream: stream ?? Readable.from([]), size: parsed.size, start: parsed.start, end: parsed.end, length };
    return { stream: stream ?? Readable.from([]), size: length, start: 0, end: length - 1, length };
  }

  /** HeadObject; S3 answers a bare 404 for a missing key. */
  async head(key: string): Promise<ObjectInfo> {
    assertObjectKey(key);
    try {
      const response = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return { key, size: response.ContentLength ?? 0 };
    } catch (error) {
      if (isNotFound(error)) throw new ObjectNotFoundError(key, { cause: error });
      throw error;
    }
  }

  /** True when HeadObject finds the key. */
  exists(key: string): Promise<boolean> {
    return existsByHead(this, key);
  }

  /** DeleteObject, which S3 already treats as idempotent. */
  async delete(key: string): Promise<void> {
    assertObjectKey(key);
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }

  /** ListObjectsV2, page by page. */
  async *list(prefix = ''): AsyncIterable<ObjectInfo> {
    assertKeyPrefix(prefix);
    let token: string | undefined;
    do {
      const page = await this.client.send(
        new ListObjectsV2Command({ Bucket: this.bucket, Prefix: prefix || undefined, ContinuationToken: token }),
      );
      for (const item of page.Contents ?? []) {
        if (item.Key !== undefined) yield { key: item.Key, size: item.Size ?? 0 };
      }
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
  }

  /** Grows the part size when the announced or allowed length would need more than 10 000 parts. */
  private partSizeFor(options: PutOptions): number {
    const largest = options.expectedBytes ?? options.maxBytes ?? 0;
    const needed = Math.ceil(largest / MAX_PARTS / MiB) * MiB;
    return Math.max(this.partSize, needed);
  }
}

function statusOf(error: unknown): number | undefined {
  return (error as { $metadata?: { httpStatusCode?: number } })?.$metadata?.httpStatusCode;
}

function isNotFound(error: unknown): boolean {
  const name = (error as { name?: string })?.name;
  return statusOf(error) === 404 || name === 'NotFound' || name === 'NoSuchKey';
}

function describe(error: unknown): string {
  return error instanceof Error ? `${error.name}: ${error.message}` : String(error);
}

/** Parses `bytes start-end/size` (inclusive bounds, size in bytes). */
function parseContentRange(header: string | undefined): { start: number; end: number; size: number } | undefined {
  const match = header ? /^bytes (\d+)-(\d+)\/(\d+)$/.exec(header) : null;
  if (!match) return undefined;
  return { start: Number(match[1]), end: Number(match[2]), size: Number(match[3]) };
}
