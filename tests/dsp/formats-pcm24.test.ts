/**
 * Widening 24-bit PCM to 32-bit: checked against Node's own two's-complement readers
 * (Buffer.readIntLE over 3 bytes, readInt32LE) rather than against the widener's arithmetic.
 */
import { randomBytes } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { FormatError, Pcm24Widener, SampleDecoder, parseDatatype, widenedPcm24Bytes } from '@/dsp/formats';

function widenAll(bytes: Uint8Array, chunkSizes: number[]): Buffer {
  const widener = new Pcm24Widener();
  const out: Uint8Array[] = [];
  let at = 0;
  for (let k = 0; at < bytes.length; k++) {
    const size = chunkSizes[k % chunkSizes.length]!;
    out.push(widener.push(bytes.subarray(at, at + size)));
    at += size;
  }
  widener.end();
  return Buffer.concat(out);
}

describe('24-bit PCM widened to 32-bit', () => {
  const values = 3 * 1_000;
  const file = randomBytes(3 * values);
  // WAV 24-bit PCM is signed two's complement, little-endian (Microsoft/IBM RIFF spec, 1991);
  // edge codes +max, -max-1, -1 and 0 are put in on purpose.
  file.writeIntLE(0x7fffff, 0, 3);
  file.writeIntLE(-0x800000, 3, 3);
  file.writeIntLE(-1, 6, 3);
  file.writeIntLE(0, 9, 3);

  it.each([[[1]], [[2]], [[4096]], [[1, 5, 7, 64 * 1024]], [[3 * values]]])('gives value x 2^8 in every int32, chunk sizes %j', (sizes) => {
    const wide = widenAll(file, sizes);
    expect(wide.length).toBe(widenedPcm24Bytes(file.length));
    for (let k = 0; k < values; k++) expect(wide.readInt32LE(4 * k)).toBe(file.readIntLE(3 * k, 3) * 256);
  });

  it('keeps the full scale: decoded as ri32_le, each value equals the 24-bit code / 2^23', () => {
    // Signed full scale x / 2^(N-1) (SigMF integer convention, CHECKS.md): 2^31 for i32, 2^23 for 24-bit.
    const wide = widenAll(file, [777]);
    const decoded = new SampleDecoder(parseDatatype('ri32_le'), 'real').decode(wide);
    for (let k = 0; k < 10; k++) expect(decoded[k]).toBeCloseTo(file.readIntLE(3 * k, 3) / 2 ** 23, 6);
    expect(decoded[0]).toBeCloseTo(1 - 2 ** -23, 6);
    expect(decoded[1]).toBe(-1);
  });

  it('refuses data that stops inside a value, naming the body', () => {
    const widener = new Pcm24Widener();
    widener.push(file.subarray(0, 7));
    expect(() => widener.end()).toThrow(FormatError);
    expect(() => widener.end()).toThrow(/1 byte\(s\) into a value/);
  });
});
