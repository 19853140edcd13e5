/**
 * The behaviour every ObjectStore must show, run against each implementation by its own test
 * file. Expected digests come from node:crypto over the very bytes sent (an implementation
 * independent of the store's streaming hash).
 */
import { createHash, randomBytes } from 'node:crypto';
import { PassThrough, Readable } from 'node:stream';
import { buffer } from 'node:stream/consumers';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  InvalidObjectKeyError,
  ObjectLengthMismatchError,
  ObjectNotFoundError,
  ObjectTooLargeError,
  RangeNotSatisfiableError,
  StorageAbortedError,
  type ObjectStore,
} from '@/lib/server/storage';

const MiB = 1024 * 1024;

export interface ContractHarness {
  store: ObjectStore;
  /** Names of anything left in the backend that is not a complete object (temp files, open uploads). */
  strays(): Promise<string[]>;
  close(): Promise<void>;
}

/** Sends `data` in chunks of `chunk` bytes, as a network body would arrive. */
export function chunked(data: Buffer, chunk = 64 * 1024): Readable {
  return Readable.from(
    (function* () {
      for (let offset = 0; offset < data.length; offset += chunk) yield data.subarray(offset, offset + chunk);
    })(),
  );
}

/** Yields `bytesBeforeFailure` random bytes, then fails like a dropped connection. */
async function* failingAfter(bytesBeforeFailure: number): AsyncGenerator<Buffer> {
  let sent = 0;
  while (sent < bytesBeforeFailure) {
    const piece = randomBytes(Math.min(256 * 1024, bytesBeforeFailure - sent));
    sent += piece.length;
    yield piece;
  }
  throw new Error('connection reset by peer (simulated)');
}

/** Endless random bytes, a little at a time, so an abort lands mid-stream. */
async function* endless(onProgress: (sent: number) => void): AsyncGenerator<Buffer> {
  let sent = 0;
  for (;;) {
    const piece = randomBytes(256 * 1024);
    sent += piece.length;
    onProgress(sent);
    yield piece;
    await new Promise((resolve) => setImmediate(resolve));
  }
}

const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex');

async function collect(iterable: AsyncIterable<{ key: string; size: number }>) {
  const out: { key: string; size: number }[] = [];
  for await (const item of iterable) out.push(item);
  return out;
}

/** Registers the contract suite for one implementation. */
export function objectStoreContract(name: string, open: () => Promise<ContractHarness>): void {
  describe(`ObjectStore contract: ${name}`, () => {
    let harness: ContractHarness;
    let store: ObjectStore;
    beforeAll(async () => {
      harness = await open();
      store = harness.store;
    });
    afterAll(async () => {
      await harness?.close();
    });

    async function expectNothingStored(key: string) {
      expect(await store.exists(key)).toBe(false);
      expect(await collect(store.list(key))).toEqual([]);
      expect(await harness.strays()).toEqual([]);
    }

    it('round-trips an empty object', async () => {
      const result = await store.put('rt/empty', chunked(Buffer.alloc(0)));
      // SHA-256 of the empty message: NIST FIPS 180-4 example digest (well-known constant).
      expect(result).toEqual({
        key: 'rt/empty',
        bytes: 0,
        sha256: 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855',
      });
      expect(await store.head('rt/empty')).toEqual({ key: 'rt/empty', size: 0 });
      const read = await store.get('rt/empty');
      expect(read).toMatchObject({ size: 0, start: 0, end: -1, length: 0 });
      expect((await buffer(read.stream)).length).toBe(0);
      await expect(store.get('rt/empty', { start: 0, end: 0 })).rejects.toBeInstanceOf(RangeNotSatisfiableError);
    });

    it('round-trips small random bytes from a web ReadableStream', async () => {
      const data = randomBytes(1000);
      const web = new ReadableStream<Uint8Array>({
        start(controller) {
          controller.enqueue(new Uint8Array(data.subarray(0, 400)));
          controller.enqueue(new Uint8Array(data.subarray(400)));
          controller.close();
        },
      });
      const result = await store.put('rt/small', web, { expectedBytes: 1000, contentType: 'application/octet-stream' });
      expect(result).toEqual({ key: 'rt/small', bytes: 1000, sha256: sha256(data) });
      expect(Buffer.compare(await buffer((await store.get('rt/small')).stream), data)).toBe(0);
    });

    describe('a multi-MiB object', () => {
      // Odd size so the last multipart part is short; over two 8 MiB parts.
      const data = randomBytes(20 * MiB + 12_345);
      const key = 'rt/multi/capture.cf32';
      beforeAll(async () => {
        const result = await store.put(key, chunked(data), { maxBytes: 64 * MiB });
        expect(result).toEqual({ key, bytes: data.length, sha256: sha256(data) });
      });

      it('reads back whole with the same digest', async () => {
        const read = await store.get(key);
        expect(read).toMatchObject({ size: data.length, start: 0, end: data.length - 1, length: data.length });
        expect(sha256(await buffer(read.stream))).toBe(sha256(data));
        expect(await store.head(key)).toEqual({ key, size: data.length });
      });

      it.each([
        ['first byte', 0, 0],
        ['middle range', 1000, 9 * MiB + 77],
        ['last byte', data.length - 1, data.length - 1],
        ['whole, explicit', 0, data.length - 1],
      ])('reads the %s', async (_label, start, end) => {
        const read = await store.get(key, { start, end });
        expect(read).toMatchObject({ size: data.length, start, end, length: end - start + 1 });
        const bytes = await buffer(read.stream);
        expect(bytes.length).toBe(end - start + 1);
        expect(Buffer.compare(bytes, data.subarray(start, end + 1))).toBe(0);
      });

      it('reads an open-ended range and clips an end past the object, as HTTP does', async () => {
        const tail = await store.get(key, { start: data.length - 10 });
        expect(Buffer.compare(await buffer(tail.stream), data.subarray(data.length - 10))).toBe(0);
        const clipped = await store.get(key, { start: data.length - 3, end: data.length + 100 });
        expect(clipped).toMatchObject({ start: data.length - 3, end: data.length - 1, length: 3 });
        expect(Buffer.compare(await buffer(clipped.stream), data.subarray(data.length - 3))).toBe(0);
      });

      it('refuses a range that starts past the end with the object size', async () => {
        const error = await store.get(key, { start: data.length }).catch((e: unknown) => e);
        expect(error).toBeInstanceOf(RangeNotSatisfiableError);
        expect((error as RangeNotSatisfiableError).size).toBe(data.length);
        await expect(store.get(key, { start: 5, end: 4 })).rejects.toBeInstanceOf(RangeError);
      });

      it('lists by prefix', async () => {
        expect(await collect(store.list('rt/multi/'))).toEqual([{ key, size: data.length }]);
        expect(await collect(store.list('rt/mu'))).toEqual([{ key, size: data.length }]);
        expect(await collect(store.list('nothing-here/'))).toEqual([]);
      });
    });

    it.each([
      ['inside the first part', 3 * MiB],
      ['after several parts', 19 * MiB],
    ])('leaves nothing when the source fails %s', async (_label, bytes) => {
      const key = `fail/source-${bytes}`;
      await expect(store.put(key, failingAfter(bytes))).rejects.toThrow(/connection reset/);
      await expectNothingStored(key);
    });

    it('stops at the size limit mid-stream and leaves nothing', async () => {
      const key = 'fail/too-large';
      const data = randomBytes(24 * MiB);
      const error = await store.put(key, chunked(data), { maxBytes: 10 * MiB + 1 }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(ObjectTooLargeError);
      expect((error as ObjectTooLargeError).maxBytes).toBe(10 * MiB + 1);
      await expectNothingStored(key);
    });

    it('accepts an object of exactly the size limit', async () => {
      const data = randomBytes(4096);
      expect((await store.put('limit/exact', chunked(data, 1000), { maxBytes: 4096 })).bytes).toBe(4096);
      await store.delete('limit/exact');
    });

    it('refuses an announced length over the limit before reading a byte', async () => {
      let pulled = false;
      const source = Readable.from(
        (function* () {
          pulled = true;
          yield Buffer.alloc(10);
        })(),
      );
      await expect(store.put('fail/announced', source, { expectedBytes: 2000, maxBytes: 1000 })).rejects.toBeInstanceOf(
        ObjectTooLargeError,
      );
      expect(pulled).toBe(false);
      await expectNothingStored('fail/announced');
    });

    it.each([
      ['short', 999],
      ['long', 1001],
    ])('refuses a %s body against the announced length and leaves nothing', async (_label, actual) => {
      const key = `fail/length-${actual}`;
      await expect(store.put(key, chunked(randomBytes(actual), 100), { expectedBytes: 1000 })).rejects.toBeInstanceOf(
        ObjectLengthMismatchError,
      );
      await expectNothingStored(key);
    });

    it('stops on an abort signal mid-stream and leaves nothing', async () => {
      const key = 'fail/aborted';
      const controller = new AbortController();
      const source = endless((sent) => {
        if (sent >= 12 * MiB && !controller.signal.aborted) controller.abort(new Error('upload cancelled by user'));
      });
      const error = await store.put(key, source, { signal: controller.signal }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(StorageAbortedError);
      expect((error as Error).name).toBe('AbortError');
      await expectNothingStored(key);
    });

    it('stops on an abort while the source waits for bytes that never come, and leaves nothing', async () => {
      const key = 'fail/stalled';
      const controller = new AbortController();
      // A client that sent 5 MiB, then went quiet without closing: only the abort can end the put.
      const source = (async function* () {
        yield randomBytes(5 * MiB);
        // The generator resumed, so the put already asked for more: abort while it waits.
        setImmediate(() => controller.abort(new Error('client went away')));
        await new Promise(() => undefined);
      })();
      const error = await store.put(key, source, { signal: controller.signal }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(StorageAbortedError);
      await expectNothingStored(key);
    });

    it('reports a stream source that failed before the put began reading it, and leaves nothing', async () => {
      const key = 'fail/early';
      const source = new PassThrough();
      const putting = store.put(key, source);
      // Like a run whose first block fails: the producer destroys its stream at once.
      source.destroy(new Error('chain failed at its first block'));
      await expect(putting).rejects.toThrow(/first block/);
      await expectNothingStored(key);
    });

    it('refuses an already aborted signal', async () => {
      await expect(
        store.put('fail/pre-aborted', chunked(randomBytes(10)), { signal: AbortSignal.abort() }),
      ).rejects.toBeInstanceOf(StorageAbortedError);
      await expectNothingStored('fail/pre-aborted');
    });

    it('deletes, and deleting again is harmless', async () => {
      await store.put('del/one', chunked(randomBytes(100)));
      expect(await store.exists('del/one')).toBe(true);
      await store.delete('del/one');
      expect(await store.exists('del/one')).toBe(false);
      await expect(store.delete('del/one')).resolves.toBeUndefined();
    });

    it('reports a missing object with ObjectNotFoundError', async () => {
      const error = await store.head('missing/object').catch((e: unknown) => e);
      expect(error).toBeInstanceOf(ObjectNotFoundError);
      expect((error as ObjectNotFoundError).key).toBe('missing/object');
      await expect(store.get('missing/object')).rejects.toBeInstanceOf(ObjectNotFoundError);
      await expect(store.get('missing/object', { start: 0, end: 9 })).rejects.toBeInstanceOf(ObjectNotFoundError);
      // A key that is a "folder" of other keys is not an object either.
      await expect(store.head('rt')).rejects.toBeInstanceOf(ObjectNotFoundError);
    });

    it.each(['../escape', 'a//b', '/abs', '.hidden', 'a/./b', 'with space', ''])(
      'rejects the unsafe key %j',
      async (key) => {
        await expect(store.put(key, chunked(Buffer.alloc(1)))).rejects.toBeInstanceOf(InvalidObjectKeyError);
        await expect(store.head(key)).rejects.toBeInstanceOf(InvalidObjectKeyError);
      },
    );
  });
}
