import { InvalidObjectKeyError, RangeNotSatisfiableError } from './errors';
import type { ByteRange } from './types';

/** Longest accepted key in characters; S3 allows 1024 bytes, local paths are happier shorter. */
export const MAX_KEY_LENGTH = 512;

// A segment may not start with a dot: that keeps `..` out of file paths and leaves dot-names
// free for the local store's temporary files, which listing then skips.
const SEGMENT = /^[A-Za-z0-9_-][A-Za-z0-9._-]*$/;
const PREFIX_CHARS = /^[A-Za-z0-9._/-]*$/;

/** Throws InvalidObjectKeyError unless `key` is slash-separated safe segments. */
export function assertObjectKey(key: string): void {
  if (typeof key !== 'string' || key.length === 0) throw new InvalidObjectKeyError(String(key), 'is empty');
  if (key.length > MAX_KEY_LENGTH) throw new InvalidObjectKeyError(key, `is longer than ${MAX_KEY_LENGTH} characters`);
  for (const segment of key.split('/')) {
    if (!SEGMENT.test(segment)) {
      throw new InvalidObjectKeyError(
        key,
        'must be non-empty segments of letters, digits, ".", "_" or "-" separated by "/", none starting with "."',
      );
    }
  }
}

/** Throws InvalidObjectKeyError unless `prefix` only holds key characters and no `..`. */
export function assertKeyPrefix(prefix: string): void {
  if (!PREFIX_CHARS.test(prefix) || prefix.includes('..') || prefix.startsWith('/')) {
    throw new InvalidObjectKeyError(prefix, 'is not a valid key prefix');
  }
}

/**
 * Turns a requested inclusive range into concrete bounds for an object of `size` bytes, clipping
 * `end` to the last byte as HTTP does. No range means the whole object (an empty object reads as
 * start 0, end -1). Throws RangeNotSatisfiableError when `start` is not inside the object.
 */
export function resolveRange(range: ByteRange | undefined, size: number): { start: number; end: number } {
  if (range === undefined) return { start: 0, end: size - 1 };
  const { start, end } = range;
  if (!Number.isSafeInteger(start) || start < 0) throw new RangeError(`range.start must be a whole number >= 0, got ${start}`);
  if (end !== undefined && (!Number.isSafeInteger(end) || end < start)) {
    throw new RangeError(`range.end must be a whole number >= range.start, got ${end}`);
  }
  if (start >= size) throw new RangeNotSatisfiableError(start, end ?? start, size);
  return { start, end: Math.min(end ?? size - 1, size - 1) };
}
