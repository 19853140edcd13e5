/**
 * A growable output buffer for streaming processors: the processor owns the array it returns until
 * its next call (src/dsp/types.ts), so one backing store per processor is enough and the steady
 * state allocates nothing.
 */

/** An empty block, shared: processors return it when they have no output yet. */
export const EMPTY_BLOCK = new Float32Array(0);

/** Reusable output storage that grows to the largest block seen. */
export class BlockBuffer {
  private store = EMPTY_BLOCK;

  /** A view of `length` values (contents undefined) valid until the next `take`. */
  take(length: number): Float32Array {
    if (length === 0) return EMPTY_BLOCK;
    if (this.store.length < length) {
      // Round up so that blocks that vary slightly in size do not reallocate every call.
      this.store = new Float32Array(Math.max(length, Math.ceil(this.store.length * 1.5)));
    }
    return this.store.length === length ? this.store : this.store.subarray(0, length);
  }
}
