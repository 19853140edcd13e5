import { randomUUID } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { mkdir, open, readdir, rename, rm, stat, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { ByteMeter, checkPutOptions, toReadable } from './byte-meter';
import { ObjectNotFoundError, StorageAbortedError } from './errors';
import { assertKeyPrefix, assertObjectKey, resolveRange } from './keys';
import type { ByteRange, ObjectInfo, ObjectRead, ObjectSource, ObjectStore, PutOptions, PutResult } from './types';

const TEMP_SUFFIX = '.partial';

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

  /** Streams the source to a temporary file, fsyncs it and renames it into place. */
  async put(key: string, source: ObjectSource, options: PutOptions = {}): Promise<PutResult> {
    assertObjectKey(key);
    checkPutOptions(options);
    const { signal } = options;
    if (signal?.aborted) throw new StorageAbortedError(signal.reason);

    const target = this.pathOf(key);
    const folder = dirname(target);
    await mkdir(folder, { recursive: true });
    const temp = join(folder, `.${basename(target)}.${randomUUID()}${TEMP_SUFFIX}`);
    const meter = new ByteMeter(options);
    // `flush` fsyncs before close: the rename must not publish a file whose data is still only
    // in the page cache. 'wx' refuses to reuse a stray temporary name.
    const file = createWriteStream(temp, { flags: 'wx', flush: true, highWaterMark: 1 << 20 });
    let published = false;
    try {
      await pipeline(toReadable(source), meter, file, signal ? { signal } : {});
      await rename(temp, target);
      published = true;
      await syncFolder(folder);
      return { key, ...meter.result() };
    } catch (error) {
      // A rename whose folder entry could not be made durable is not a completed put either.
      if (published) await rm(target, { force: true });
      // Wait for the descriptor to close: removing the name while the open is still pending
      // would let the open create the file again afterwards.
      file.destroy();
      if (!file.closed) await new Promise<void>((resolve) => file.once('close', () => resolve()));
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
  async exists(key: string): Promise<boolean> {
    try {
      await this.head(key);
      return true;
    } catch (error) {
      if (error instanceof ObjectNotFoundError) return false;
      throw error;
    }
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
