/**
 * s3rver 3.7.1 answers two kinds of Range request differently from S3, which the contract would
 * (rightly) flag as store bugs:
 *  - `bytes=0-0` returns the whole object (its store reads `end || Infinity`, and 0 is falsy);
 *  - any range on an empty object returns 200 with no body instead of 416.
 * S3's documented behaviour (RFC 9110 section 14 byte ranges, as S3 GetObject applies them) is
 * restored here by replacing the fake's ranged read; whole-object reads stay untouched.
 */
import { createReadStream } from 'node:fs';
import { once } from 'node:events';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

interface FakeStore {
  getMetadata(bucket: string, key: string): Promise<Record<string, string>>;
  getResourcePath(bucket: string, key: string, resource: string): string;
  getObject(bucket: string, key: string, options?: { start?: number; end?: number }): Promise<unknown>;
}
interface FakeObject {
  range?: { start: number; end: number };
}

let applied = false;

/** Replaces s3rver's ranged read with one that follows S3; idempotent. */
export function fixS3rverRanges(): void {
  if (applied) return;
  applied = true;
  const FilesystemStore = require('s3rver/lib/stores/filesystem') as { prototype: FakeStore };
  const S3Object = require('s3rver/lib/models/object') as new (
    bucket: string,
    key: string,
    content: unknown,
    metadata: Record<string, string>,
  ) => FakeObject;
  const wholeRead = FilesystemStore.prototype.getObject;

  FilesystemStore.prototype.getObject = async function (this: FakeStore, bucket, key, options) {
    if (options?.start === undefined) return wholeRead.call(this, bucket, key, options);
    let metadata: Record<string, string>;
    try {
      metadata = await this.getMetadata(bucket, key);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
      throw error;
    }
    const size = Number(metadata['content-length']);
    const range = { start: options.start, end: Math.min(options.end ?? Infinity, size - 1) };
    if (range.start >= size || range.end < range.start) {
      // No content plus a range is how the fake's controller knows to answer 416 InvalidRange.
      const unsatisfiable = new S3Object(bucket, key, null, metadata);
      unsatisfiable.range = range;
      return unsatisfiable;
    }
    const content = createReadStream(this.getResourcePath(bucket, key, 'object'), range);
    await once(content, 'open');
    const object = new S3Object(bucket, key, content, metadata);
    object.range = range;
    return object;
  };
}
