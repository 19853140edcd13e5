/**
 * 24-bit PCM has no SigMF datatype, so 24-bit WAV samples are widened to 32-bit signed integers
 * on the way in: each little-endian 3-byte value becomes the top three bytes of a little-endian
 * int32 with a zero low byte. That is the value times 2^8, so with signed full scale x / 2^(N-1)
 * (full-scale.ts) the widened sample reads exactly as the 24-bit one did: 2^23 -> 2^31, both 1.0
 * FS. Lossless; the stored data grows by a third.
 */
import { FormatError } from './datatype';

/** Stored bytes of `pcm24Bytes` bytes of 24-bit values once widened to 32 bits. */
export function widenedPcm24Bytes(pcm24Bytes: number): number {
  return (pcm24Bytes / 3) * 4;
}

/** Widens a stream of 24-bit little-endian values to 32-bit ones; values may straddle chunks. */
export class Pcm24Widener {
  private readonly carry = new Uint8Array(3);
  private carryLength = 0;

  /** Widened bytes of every whole value completed by `chunk` (bytes of a partial value wait for the next chunk). */
  push(chunk: Uint8Array): Uint8Array {
    const total = this.carryLength + chunk.byteLength;
    const values = Math.floor(total / 3);
    const out = new Uint8Array(values * 4);
    let read = 0;
    let written = 0;
    if (this.carryLength > 0 && values > 0) {
      const need = 3 - this.carryLength;
      this.carry.set(chunk.subarray(0, need), this.carryLength);
      out[1] = this.carry[0]!;
      out[2] = this.carry[1]!;
      out[3] = this.carry[2]!;
      read = need;
      written = 4;
      this.carryLength = 0;
    }
    for (; written < out.length; read += 3, written += 4) {
      out[written + 1] = chunk[read]!;
      out[written + 2] = chunk[read + 1]!;
      out[written + 3] = chunk[read + 2]!;
    }
    const left = chunk.byteLength - read;
    if (left > 0) {
      this.carry.set(chunk.subarray(read), this.carryLength);
      this.carryLength += left;
    }
    return out;
  }

  /** Ends the stream; FormatError (field `body`) when it stopped inside a value. */
  end(): void {
    if (this.carryLength > 0) {
      throw new FormatError(`body: the 24-bit sample data ends ${this.carryLength} byte(s) into a value`, 'body', { code: 'truncated' });
    }
  }
}
