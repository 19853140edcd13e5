import { randomUUID } from 'node:crypto';
import { mkdir, open, readdir, rename, rm, stat, unlink, type FileHandle } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { Readable } from 'node:stream';
import { ByteTally, checkPutOptions, chunksOf } from './byte-meter';
import { ObjectNotFoundError, StorageAbortedError, existsByHead } from './errors';
import { assertKeyPrefix, assertObjectKey, resolveRange } from './keys';
import type { ByteRange, ObjectInfo, ObjectRead, ObjectSource, ObjectStore, PutOptions, PutResult } from './types';

const TEMP_SUFFIX = '.partial';
/** Bytes gathered before one `writev` (bytes); two batches at most are held per put. */
const WRITE_BATCH_BYTES = 4 * 1024 * 1024;
/** Buffers one `writev` call takes at most (Linux IOV_MAX is 1024). */
const MAX_BUFFERS_PER_WRITE = 1024;

/**
 * Objects as plain files under one root folder (`${QUADRILLE_DATA_DIR}/objects`), one file per
 * key, sub-folders following the key's slashes. A put writes a dot-named temporary file beside
 * the target, flushes it to disk and renames it over the target, so readers only ever see whole
 * objects and a crash or failure leaves at most a dot-file that listing ignores.
 */
export class LocalFileStore implements ObjectStore {
  readonly kind = 'local' as const;
  /** Absolute folder holding the objects. */
  readonly root: string;

  constructor(root: string) {
    this.root = root;
  }

  /**
   * Streams the source to a temporary file, fsyncs it and renames it into place. Chunks are
   * gathered into batches of WRITE_BATCH_BYTES written with one `writev` each, and the next batch
   * is gathered (hashed, counted) while the previous one is being written: at most two batches
   * are held, and a slow disk slows the sender through the source's back-pressure.
   */
  async put(key: string, source: ObjectSource, options: PutOptions = {}): Promise<PutResult> {
    assertObjectKey(key);
    checkPutOptions(options);
    const { signal } = options;
    if (signal?.aborted) throw new StorageAbortedError(signal.reason);

    // A stream source may fail before the loop below starts reading it (a run that fails at its
    // first block); the loop still sees that error, but without a listener meanwhile it would
    // also be thrown as an uncaught 'error' event.
    if (source instanceof Readable) source.on('error', ignoreError);
    const target = this.pathOf(key);
    const folder = dirname(target);
    await mkdir(folder, { recursive: true });
    const temp = join(folder, `.${basename(target)}.${randomUUID()}${TEMP_SUFFIX}`);
    const tally = new ByteTally(options);
    // 'wx' refuses to reuse a stray temporary name.
    const file = await open(temp, 'wx');
    let closed = false;
    let writing: Promise<void> | null = null;
    let published = false;
    try {
      let batch: Uint8Array[] = [];
      let batchBytes = 0;
      for await (const chunk of abortable(chunksOf(source), signal)) {
        tally.add(chunk);
        batch.push(chunk);
        batchBytes += chunk.byteLength;
        if (batchBytes >= WRITE_BATCH_BYTES) {
          await writing;
          writing = writeAll(file, batch);
          batch = [];
          batchBytes = 0;
        }
      }
      tally.finish();
      await writing;
      writing = null;
      if (batch.length > 0) await writeAll(file, batch);
      // The rename must not publish a file whose data is still only in the page cache.
      await file.sync();
      closed = true;
      await file.close();
      await rename(temp, target);
      published = true;
      await syncFolder(folder);
      return { key, ...tally.result() };
    } catch (error) {
      // A rename whose folder entry could not be made durable is not a completed put either.
      if (published) await rm(target, { force: true });
      // Let a write in flight end before the descriptor closes and the name goes.
      await writing?.catch(() => undefined);
      if (!closed) await file.close().catch(() => undefined);
      await rm(temp, { force: true });
      if (signal?.aborted) throw new StorageAbortedError(signal.reason);
      throw error;
    }
  }

  /** Opens the file first, so a missing object fails here rather than in the stream. */
  async get(key: string, range?: ByteRange): Promise<ObjectRead> {
    assertObjectKey(key);
    const path = this.pathOf(key);
    let handle;
    try {
      handle = await open(path, 'r');
    } catch (error) {
      throw mapMissing(error, key);
    }
    try {
      const info = await handle.stat();
      if (!info.isFile()) throw new ObjectNotFoundError(key);
      const { start, end } = resolveRange(range, info.size);
      if (end < start) {
        // Empty object read whole: createReadStream cannot express "no bytes", so hand back an ended stream.
        await handle.close();
        return { stream: Readable.from([]), size: info.size, start, end, length: 0 };
      }
      const stream = handle.createReadStream({ start, end, autoClose: true, highWaterMark: 1 << 20 });
      return { stream, size: info.size, start, end, length: end - start + 1 };
    } catch (error) {
      await handle.close();
      throw error;
    }
  }

  /** Size from the file system. */
  async head(key: string): Promise<ObjectInfo> {
    assertObjectKey(key);
    try {
      const info = await stat(this.pathOf(key));
      if (!info.isFile()) throw new ObjectNotFoundError(key);
      return { key, size: info.size };
    } catch (error) {
      throw mapMissing(error, key);
    }
  }

  /** True when the file exists. */
  exists(key: string): Promise<boolean> {
    return existsByHead(this, key);
  }

  /** Unlinks the file; empty folders are left in place so a concurrent put into them cannot lose its folder. */
  async delete(key: string): Promise<void> {
    assertObjectKey(key);
    try {
      await unlink(this.pathOf(key));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
    }
  }

  /** Walks the folder tree in key order, skipping temporary dot-files. */
  async *list(prefix = ''): AsyncIterable<ObjectInfo> {
    assertKeyPrefix(prefix);
    yield* this.walk('', prefix);
  }

  private async *walk(relative: string, prefix: string): AsyncGenerator<ObjectInfo> {
    let entries;
    try {
      entries = await readdir(relative ? join(this.root, relative) : this.root, { withFileTypes: true });
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return;
      throw error;
    }
    const names = entries.filter((entry) => !entry.name.startsWith('.'));
    names.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    for (const entry of names) {
      const key = relative ? `${relative}/${entry.name}` : entry.name;
      if (entry.isDirectory()) {
        // Descend only where the folder can still hold keys with this prefix.
        if (prefix.startsWith(`${key}/`) || `${key}/`.startsWith(prefix)) yield* this.walk(key, prefix);
      } else if (entry.isFile() && key.startsWith(prefix)) {
        try {
          const info = await stat(join(this.root, key));
          yield { key, size: info.size };
        } catch (error) {
          if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
        }
      }
    }
  }

  private pathOf(key: string): string {
    return join(this.root, ...key.split('/'));
  }
}

function mapMissing(error: unknown, key: string): unknown {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === 'ENOENT' || code === 'ENOTDIR' || code === 'EISDIR') return new ObjectNotFoundError(key, { cause: error });
  return error;
}

/** fsyncs a folder so a completed rename survives a power cut. */
async function syncFolder(folder: string): Promise<void> {
  const handle = await open(folder, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

function ignoreError(): void {
  // The put reports the source's error through its own read loop.
}

/** Writes every byte of `buffers` at the file's current position (writev may write part of them). */
async function writeAll(file: FileHandle, buffers: Uint8Array[]): Promise<void> {
  let pending = buffers;
  while (pending.length > 0) {
    const slice = pending.slice(0, MAX_BUFFERS_PER_WRITE);
    let { bytesWritten } = await file.writev(slice);
    const rest = pending.slice(slice.length);
    // Drop the buffers written whole, keep the unwritten tail of a partly written one.
    let index = 0;
    while (index < slice.length && bytesWritten >= slice[index]!.byteLength) bytesWritten -= slice[index++]!.byteLength;
    pending = index < slice.length ? [slice[index]!.subarray(bytesWritten), ...slice.slice(index + 1), ...rest] : rest;
  }
}

/**
 * Iterates `chunks`, ending with StorageAbortedError as soon as `signal` aborts, even while the
 * source is waiting for bytes that will never come (a client that stopped sending). Each wait
 * gets its own abort listener, removed when the chunk arrives: racing every chunk against one
 * long-lived promise would keep every chunk reachable from that promise until the put ends.
 */
async function* abortable(chunks: AsyncIterable<Uint8Array>, signal: AbortSignal | undefined): AsyncGenerator<Uint8Array> {
  if (!signal) {
    yield* chunks;
    return;
  }
  const iterator = chunks[Symbol.asyncIterator]();
  try {
    for (;;) {
      if (signal.aborted) throw new StorageAbortedError(signal.reason);
      const next = await untilAborted(iterator.next(), signal);
      if (next.done) return;
      yield next.value;
    }
  } finally {
    // Stop the source (destroys a Node stream) without waiting on a stalled one.
    void Promise.resolve(iterator.return?.()).catch(() => undefined);
  }
}

/** `pending`, or StorageAbortedError as soon as `signal` aborts. */
function untilAborted<T>(pending: Promise<T>, signal: AbortSignal): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const onAbort = () => reject(new StorageAbortedError(signal.reason));
    signal.addEventListener('abort', onAbort, { once: true });
    pending.then(
      (value) => {
        signal.removeEventListener('abort', onAbort);
        resolve(value);
      },
      (error: unknown) => {
        signal.removeEventListener('abort', onAbort);
        reject(error);
      },
    );
  });
}
