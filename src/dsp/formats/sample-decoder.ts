/**
 * Streaming sample decoder: byte blocks of any size in, Float32Array blocks of whole samples out.
 * A sample may straddle two byte blocks; its leading bytes wait in a small carry buffer.
 */
import type { SampleType } from '../types';
import { valuesPerSample } from '../types';
import { FormatError, type ValueEncoding } from './datatype';
import { canViewNatively, decodeValues } from './value-codec';

export interface SampleDecoderOptions {
  /**
   * Allow the returned block to be a view of the caller's bytes (float32 little-endian, aligned,
   * nothing carried over) or a buffer the decoder reuses. Such a block is valid only until the
   * next call or until the caller overwrites its bytes. Default false: every block is fresh.
   */
  zeroCopy?: boolean;
  /** Reject NaN and infinite values in float data (default true). */
  checkFinite?: boolean;
}

/** Decodes a byte stream of one encoding and layout into float32 blocks (full scale 1.0). */
export class SampleDecoder {
  readonly encoding: ValueEncoding;
  readonly layout: SampleType;
  /** Bytes per sample: value width x values per sample. */
  readonly bytesPerSample: number;
  private readonly valuesPerSample: number;
  private readonly bytesPerValue: number;
  private readonly carry: Uint8Array;
  private carryLength = 0;
  private samples = 0;
  private scratch = new Float32Array(0);
  private readonly zeroCopy: boolean;
  private readonly checkFinite: boolean;

  constructor(encoding: ValueEncoding, layout: SampleType, options: SampleDecoderOptions = {}) {
    this.encoding = encoding;
    this.layout = layout;
    this.valuesPerSample = valuesPerSample(layout);
    this.bytesPerValue = encoding.bits / 8;
    this.bytesPerSample = this.bytesPerValue * this.valuesPerSample;
    this.carry = new Uint8Array(this.bytesPerSample);
    this.zeroCopy = options.zeroCopy ?? false;
    this.checkFinite = (options.checkFinite ?? true) && encoding.kind === 'f';
  }

  /** Whole samples decoded so far. */
  get samplesDecoded(): number {
    return this.samples;
  }

  /** Decode the next byte block; returns the values of every sample it completes (may be empty). */
  decode(bytes: Uint8Array): Float32Array {
    const bps = this.bytesPerSample;
    let start = 0;
    let fromCarry = 0;
    if (this.carryLength > 0) {
      const need = bps - this.carryLength;
      const take = Math.min(need, bytes.length);
      this.carry.set(bytes.subarray(0, take), this.carryLength);
      this.carryLength += take;
      start = take;
      if (this.carryLength < bps) return new Float32Array(0);
      fromCarry = 1;
    }
    const whole = Math.floor((bytes.length - start) / bps);
    const body = bytes.subarray(start, start + whole * bps);
    const vps = this.valuesPerSample;
    const valueCount = (fromCarry + whole) * vps;

    let out: Float32Array;
    if (this.zeroCopy && fromCarry === 0 && this.encoding.kind === 'f' && this.encoding.bits === 32 && canViewNatively(this.encoding, body)) {
      out = new Float32Array(body.buffer, body.byteOffset, whole * vps);
    } else {
      out = this.outputBuffer(valueCount);
      if (fromCarry) {
        decodeValues(this.encoding, this.carry, vps, out, 0);
        this.carryLength = 0;
      }
      decodeValues(this.encoding, body, whole * vps, out, fromCarry * vps);
    }

    const rest = bytes.length - start - whole * bps;
    if (rest > 0) {
      this.carry.set(bytes.subarray(bytes.length - rest));
      this.carryLength = rest;
    }
    if (this.checkFinite) this.assertFinite(out);
    this.samples += fromCarry + whole;
    return out;
  }

  /** End of stream: throws FormatError when bytes of an incomplete sample are left over. */
  end(): void {
    if (this.carryLength > 0) {
      throw new FormatError(
        `data: ${this.carryLength} trailing byte(s) after sample ${this.samples} do not make a whole sample of ${this.bytesPerSample} bytes (truncated file or wrong datatype?)`,
        'data',
        { code: 'truncated', sampleIndex: this.samples },
      );
    }
  }

  private outputBuffer(length: number): Float32Array {
    if (!this.zeroCopy) return new Float32Array(length);
    if (this.scratch.length < length) this.scratch = new Float32Array(Math.max(length, this.scratch.length * 2));
    return this.scratch.subarray(0, length);
  }

  private assertFinite(out: Float32Array): void {
    if (allFinite(out)) return;
    for (let k = 0; k < out.length; k++) {
      const v = out[k];
      if (!Number.isFinite(v)) {
        const index = this.samples + Math.floor(k / this.valuesPerSample);
        const part = this.valuesPerSample === 1 ? '' : this.layout === 'complex' ? (k % 2 ? ' (Q)' : ' (I)') : ` (channel ${k % 2})`;
        throw new FormatError(`data: sample ${index}${part} is ${v} (NaN or infinite values are not valid samples)`, 'data', { sampleIndex: index });
      }
    }
  }
}

/**
 * True when every value is finite. x - x is 0 for every finite x and NaN for NaN and +-Infinity;
 * four independent sums keep the adder pipeline full (twice as fast as one running sum).
 */
export function allFinite(values: Float32Array): boolean {
  let b0 = 0, b1 = 0, b2 = 0, b3 = 0;
  const whole = values.length - (values.length & 3);
  let k = 0;
  for (; k < whole; k += 4) {
    b0 += values[k] - values[k];
    b1 += values[k + 1] - values[k + 1];
    b2 += values[k + 2] - values[k + 2];
    b3 += values[k + 3] - values[k + 3];
  }
  for (; k < values.length; k++) b0 += values[k] - values[k];
  return b0 + b1 + b2 + b3 === 0;
}
