/**
 * Finds NaN and infinite values in IEEE 754 float sample bytes as they stream past, without
 * decoding them: a binary32/binary64 value is NaN or infinite exactly when every exponent bit is
 * set (IEEE 754-2019, section 3.4), and the exponent sits in the value's two most significant
 * bytes (binary32: 0x7F | 0x80, binary64: 0x7F | 0xF0). One byte test per value, whatever the
 * chunk's alignment or byte order; values that straddle two chunks are put together first.
 */
import { FormatError, type Datatype } from '@/dsp/formats';
import type { SampleType } from '@/dsp/types';
import { valuesPerSample } from '@/dsp/types';

export class FiniteScanner {
  private readonly width: number;
  /** Offsets of the most significant exponent byte and the next one inside a value. */
  private readonly high: number;
  private readonly low: number;
  private readonly lowMask: number;
  private readonly carry: Uint8Array;
  private carryLength = 0;
  /** Values scanned so far. */
  private values = 0;

  constructor(
    private readonly datatype: Datatype,
    private readonly layout: SampleType,
  ) {
    this.width = datatype.bits / 8;
    this.high = datatype.littleEndian ? this.width - 1 : 0;
    this.low = datatype.littleEndian ? this.width - 2 : 1;
    this.lowMask = this.width === 4 ? 0x80 : 0xf0;
    this.carry = new Uint8Array(this.width);
  }

  /** Scans the next bytes; throws FormatError (field `body`) naming the first bad sample. */
  scan(bytes: Uint8Array): void {
    const width = this.width;
    let start = 0;
    if (this.carryLength > 0) {
      const take = Math.min(width - this.carryLength, bytes.length);
      this.carry.set(bytes.subarray(0, take), this.carryLength);
      this.carryLength += take;
      start = take;
      if (this.carryLength < width) return;
      this.check(this.carry, 0, this.values);
      this.values++;
      this.carryLength = 0;
    }
    const whole = Math.floor((bytes.length - start) / width);
    const end = start + whole * width;
    const { high, low, lowMask } = this;
    for (let at = start; at < end; at += width) {
      if ((bytes[at + high]! & 0x7f) === 0x7f && (bytes[at + low]! & lowMask) === lowMask) {
        this.check(bytes, at, this.values + (at - start) / width);
      }
    }
    this.values += whole;
    if (end < bytes.length) {
      this.carry.set(bytes.subarray(end));
      this.carryLength = bytes.length - end;
    }
  }

  /** Throws for the value at byte `at` of `bytes` (value number `index` of the stream) unless finite. */
  private check(bytes: Uint8Array, at: number, index: number): void {
    const view = new DataView(bytes.buffer, bytes.byteOffset + at, this.width);
    const value = this.width === 4 ? view.getFloat32(0, this.datatype.littleEndian) : view.getFloat64(0, this.datatype.littleEndian);
    if (Number.isFinite(value)) return;
    const perSample = valuesPerSample(this.layout);
    const sample = Math.floor(index / perSample);
    const part = perSample === 1 ? '' : this.layout === 'complex' ? (index % 2 ? ' (Q)' : ' (I)') : ` (channel ${index % 2})`;
    throw new FormatError(`body: sample ${sample}${part} is ${value} (NaN or infinite values are not valid samples)`, 'body', { sampleIndex: sample });
  }
}
