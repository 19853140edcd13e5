/**
 * Pulls an upload body chunk by chunk for the format parsers: exact-length reads for headers
 * (small, copied) and pass-through iteration for sample data (chunks handed on as they arrive,
 * never gathered), so memory stays at a chunk or two whatever the capture size.
 */
import { FormatError } from '@/dsp/formats';

/** Source of body chunks: `request.body`'s reader, or any async iterator of bytes. */
export type ChunkSource = AsyncIterator<Uint8Array, unknown, undefined>;

export class ByteReader {
  private pending: Uint8Array | null = null;
  private ended = false;
  /** Bytes handed out so far (headers, data and skipped bytes alike). */
  position = 0;

  constructor(private readonly source: ChunkSource) {}

  private async pull(): Promise<Uint8Array | null> {
    if (this.pending) {
      const chunk = this.pending;
      this.pending = null;
      return chunk;
    }
    if (this.ended) return null;
    for (;;) {
      const next = await this.source.next();
      if (next.done) {
        this.ended = true;
        return null;
      }
      if (next.value.byteLength > 0) return next.value;
    }
  }

  private unread(chunk: Uint8Array): void {
    if (chunk.byteLength > 0) this.pending = chunk;
  }

  /**
   * Exactly `length` bytes (copied into one array), or fewer only when the body ends first; the
   * caller decides whether a short read is an error.
   */
  async read(length: number): Promise<Uint8Array> {
    const out = new Uint8Array(length);
    let filled = 0;
    while (filled < length) {
      const chunk = await this.pull();
      if (!chunk) {
        this.position += filled;
        return out.subarray(0, filled);
      }
      const take = Math.min(length - filled, chunk.byteLength);
      out.set(chunk.subarray(0, take), filled);
      filled += take;
      this.unread(chunk.subarray(take));
    }
    this.position += length;
    return out;
  }

  /** Exactly `length` bytes, or a FormatError naming `field` when the body ends first. */
  async readExact(length: number, field: string, what: string): Promise<Uint8Array> {
    const bytes = await this.read(length);
    if (bytes.byteLength < length) {
      throw new FormatError(`${field}: the body ends inside ${what} (truncated upload)`, field, { code: 'truncated' });
    }
    return bytes;
  }

  /** The next `length` bytes as they arrive; throws a FormatError naming `field` if the body ends first. */
  async *take(length: number, field: string, what: string): AsyncGenerator<Uint8Array, void, undefined> {
    let left = length;
    while (left > 0) {
      const chunk = await this.pull();
      if (!chunk) {
        throw new FormatError(`${field}: the body ends ${left} bytes before the end of ${what} (truncated upload)`, field, { code: 'truncated' });
      }
      const take = Math.min(left, chunk.byteLength);
      this.unread(chunk.subarray(take));
      left -= take;
      this.position += take;
      yield take === chunk.byteLength ? chunk : chunk.subarray(0, take);
    }
  }

  /** Every remaining byte as it arrives. */
  async *rest(): AsyncGenerator<Uint8Array, void, undefined> {
    for (let chunk = await this.pull(); chunk; chunk = await this.pull()) {
      this.position += chunk.byteLength;
      yield chunk;
    }
  }

  /** Discards `length` bytes (or up to the end when the body is shorter); answers how many were skipped. */
  async skip(length: number): Promise<number> {
    let left = length;
    while (left > 0) {
      const chunk = await this.pull();
      if (!chunk) break;
      const take = Math.min(left, chunk.byteLength);
      this.unread(chunk.subarray(take));
      left -= take;
      this.position += take;
    }
    return length - left;
  }

  /** True once no byte is left. */
  async atEnd(): Promise<boolean> {
    const chunk = await this.pull();
    if (!chunk) return true;
    this.unread(chunk);
    return false;
  }
}
