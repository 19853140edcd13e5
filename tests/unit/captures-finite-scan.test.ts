/**
 * The upload's NaN/infinity scan against the platform's own IEEE 754 decoding (DataView and
 * Number.isFinite): every float datatype, any chunking, values straddling chunks.
 */
import { describe, expect, it } from 'vitest';
import { parseDatatype } from '@/dsp/formats';
import { FiniteScanner } from '@/lib/server/captures/ingest/finite-scan';

const floatTypes = ['cf32_le', 'cf32_be', 'cf64_le', 'cf64_be', 'rf32_le', 'rf64_be'];

function bytesOf(datatype: string, values: number[]): Uint8Array {
  const { bits, littleEndian } = parseDatatype(datatype);
  const width = bits / 8;
  const out = new Uint8Array(values.length * width);
  const view = new DataView(out.buffer);
  values.forEach((value, k) => (width === 4 ? view.setFloat32(k * width, value, littleEndian) : view.setFloat64(k * width, value, littleEndian)));
  return out;
}

function scanInChunks(datatype: string, bytes: Uint8Array, chunk: number): string | null {
  const type = parseDatatype(datatype);
  const scanner = new FiniteScanner(type, type.complex ? 'complex' : 'real');
  try {
    for (let at = 0; at < bytes.length; at += chunk) scanner.scan(bytes.subarray(at, at + chunk));
    return null;
  } catch (error) {
    return (error as Error).message;
  }
}

describe('FiniteScanner', () => {
  it.each(floatTypes)('%s: passes finite extremes and finds NaN and infinities wherever chunks split', (datatype) => {
    const wide = datatype.includes('64');
    // Largest finite, smallest subnormal and signed zero are valid samples (IEEE 754-2019, 3.4).
    const finite = [0, -0, 1, -1, wide ? Number.MAX_VALUE : 3.4028234663852886e38, wide ? 5e-324 : 1.401298464324817e-45, -123.5];
    for (const chunk of [1, 3, 7, 64]) expect(scanInChunks(datatype, bytesOf(datatype, finite), chunk)).toBeNull();
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      const values = Array.from({ length: 40 }, (_, k) => Math.sin(k));
      values[23] = bad;
      const complex = datatype.startsWith('c');
      const where = complex ? `sample 11 (Q) is ${bad}` : `sample 23 is ${bad}`;
      for (const chunk of [1, 5, 13, 4096]) expect(scanInChunks(datatype, bytesOf(datatype, values), chunk)).toContain(where);
    }
  });

  it('agrees with Number.isFinite on random bit patterns', () => {
    const type = parseDatatype('rf32_le');
    const bytes = new Uint8Array(4 * 20_000);
    for (let k = 0; k < bytes.length; k++) bytes[k] = (k * 2654435761) >>> 13 & 0xff;
    const view = new DataView(bytes.buffer);
    let firstBad = -1;
    for (let k = 0; k < 20_000 && firstBad < 0; k++) if (!Number.isFinite(view.getFloat32(4 * k, true))) firstBad = k;
    const scanner = new FiniteScanner(type, 'real');
    const message = (() => {
      try {
        scanner.scan(bytes);
        return null;
      } catch (error) {
        return (error as Error).message;
      }
    })();
    // About one pattern in 256 has every exponent bit set, so 20 000 of them hold some.
    expect(firstBad).toBeGreaterThanOrEqual(0);
    expect(message).toContain(`sample ${firstBad} is`);
  });
});
