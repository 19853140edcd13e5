/**
 * Streaming sample encoder: Float32Array blocks (full scale 1.0) in, bytes of one encoding out.
 * Integer codes are rounded and clipped (see full-scale.ts); the number clipped is counted so a
 * caller can warn. NaN and infinite values are refused: no integer code or honest file holds them.
 */
import type { SampleType } from '../types';
import { valuesPerSample } from '../types';
import { FormatError, type ValueEncoding } from './datatype';
import { canViewNatively, encodeValues } from './value-codec';
import { allFinite } from './sample-decoder';

export interface SampleEncoderOptions {
  /**
   * Allow the returned bytes to be a view of the input block (float32 little-endian) or a buffer
   * the encoder reuses: valid until the next call or until the caller changes the input.
   */
  zeroCopy?: boolean;
}

/** Encodes float32 blocks of one layout into bytes of one encoding. */
export class SampleEncoder {
  readonly encoding: ValueEncoding;
  readonly layout: SampleType;
  readonly bytesPerSample: number;
  private readonly valuesPerSample: number;
  private samples = 0;
  private clipped = 0;
  private scratch = new Uint8Array(0);
  private readonly zeroCopy: boolean;

  constructor(encoding: ValueEncoding, layout: SampleType, options: SampleEncoderOptions = {}) {
    this.encoding = encoding;
    this.layout = layout;
    this.valuesPerSample = valuesPerSample(layout);
    this.bytesPerSample = (encoding.bits / 8) * this.valuesPerSample;
    this.zeroCopy = options.zeroCopy ?? false;
  }

  /** Whole samples encoded so far. */
  get samplesEncoded(): number {
    return this.samples;
  }

  /** Values clipped to the integer code range so far. */
  get clippedValues(): number {
    return this.clipped;
  }

  /** Encode one block of whole samples; throws FormatError on NaN/Inf (naming the sample index). */
  encode(values: Float32Array): Uint8Array {
    const vps = this.valuesPerSample;
    if (values.length % vps !== 0) {
      throw new FormatError(`encode: block of ${values.length} values is not a whole number of ${this.layout} samples`, 'data');
    }
    this.assertFinite(values);
    const byteLength = values.length * (this.encoding.bits / 8);
    const view = new Uint8Array(values.buffer, values.byteOffset, values.byteLength);
    let out: Uint8Array;
    if (this.zeroCopy && this.encoding.kind === 'f' && this.encoding.bits === 32 && canViewNatively(this.encoding, view)) {
      out = view;
    } else {
      out = this.outputBuffer(byteLength);
      this.clipped += encodeValues(this.encoding, values, out);
    }
    this.samples += values.length / vps;
    return out;
  }

  private outputBuffer(length: number): Uint8Array {
    if (!this.zeroCopy) return new Uint8Array(length);
    // Keep the buffer 8-byte aligned so native typed views of it always work.
    if (this.scratch.length < length) this.scratch = new Uint8Array(Math.max(length, this.scratch.length * 2));
    return this.scratch.subarray(0, length);
  }

  private assertFinite(values: Float32Array): void {
    if (allFinite(values)) return;
    for (let k = 0; k < values.length; k++) {
      if (!Number.isFinite(values[k])) {
        const index = this.samples + Math.floor(k / this.valuesPerSample);
        throw new FormatError(`data: sample ${index} is ${values[k]}; NaN or infinite values cannot be written`, 'data', { sampleIndex: index });
      }
    }
  }
}
