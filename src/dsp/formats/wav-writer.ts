/**
 * WAV writer: a header for a known frame count plus a streaming encoder for the data chunk.
 * A caller that does not know the length up front writes `header(0)` first and overwrites the
 * first `headerBytes` once the count is known. Layout facts and sources: wav-format.ts.
 */
import type { SampleType } from '../types';
import { FormatError } from './datatype';
import { SampleEncoder } from './sample-encoder';
import {
  SUBFORMAT_GUID_TAIL, WAVE_FORMAT_EXTENSIBLE, wavEncoding, wavSampleFormatInfo, type WavSpec,
} from './wav-format';

/** Streams samples into WAV bytes: `header(frames)`, then `encode(block)`..., then `trailer()`. */
export class WavWriter {
  readonly spec: WavSpec;
  readonly blockAlign: number;
  /** Size of the header in bytes: 44 plain, 68 extensible. */
  readonly headerBytes: number;
  private readonly encoder: SampleEncoder;
  private readonly formatTag: number;
  private readonly bits: number;

  constructor(spec: WavSpec) {
    if (!(Number.isInteger(spec.sampleRate) && spec.sampleRate > 0 && spec.sampleRate <= 0xffffffff)) {
      throw new FormatError(`sampleRate: must be a positive whole number of Hz for WAV, got ${spec.sampleRate}`, 'sampleRate');
    }
    if (spec.channels !== 1 && spec.channels !== 2) {
      throw new FormatError(`channels: must be 1 or 2, got ${String(spec.channels)}`, 'channels');
    }
    this.spec = spec;
    const { formatTag, bits } = wavSampleFormatInfo(spec.sampleFormat);
    this.formatTag = formatTag;
    this.bits = bits;
    this.blockAlign = spec.channels * (bits / 8);
    this.headerBytes = spec.extensible ? 68 : 44;
    const layout: SampleType = spec.channels === 2 ? 'real-pair' : 'real';
    this.encoder = new SampleEncoder(wavEncoding(formatTag, bits), layout);
  }

  /** Values clipped to the PCM code range so far. */
  get clippedValues(): number {
    return this.encoder.clippedValues;
  }

  /** The RIFF header, `fmt ` chunk and `data` chunk header for `frames` frames. */
  header(frames: number): Uint8Array {
    const dataBytes = frames * this.blockAlign;
    const pad = dataBytes % 2;
    const riffSize = this.headerBytes - 8 + dataBytes + pad;
    if (riffSize > 0xffffffff) throw new FormatError(`data: ${frames} frames exceed the 4 GiB a WAV file can hold`, 'data');
    const out = new Uint8Array(this.headerBytes);
    const dv = new DataView(out.buffer);
    writeAscii(out, 0, 'RIFF');
    dv.setUint32(4, riffSize, true);
    writeAscii(out, 8, 'WAVE');
    writeAscii(out, 12, 'fmt ');
    const fmtSize = this.spec.extensible ? 40 : 16;
    dv.setUint32(16, fmtSize, true);
    dv.setUint16(20, this.spec.extensible ? WAVE_FORMAT_EXTENSIBLE : this.formatTag, true);
    dv.setUint16(22, this.spec.channels, true);
    dv.setUint32(24, this.spec.sampleRate, true);
    dv.setUint32(28, this.spec.sampleRate * this.blockAlign, true);
    dv.setUint16(32, this.blockAlign, true);
    dv.setUint16(34, this.bits, true);
    let p = 36;
    if (this.spec.extensible) {
      dv.setUint16(36, 22, true); // cbSize
      dv.setUint16(38, this.bits, true); // valid bits per sample
      dv.setUint32(40, this.spec.channels === 2 ? 0x3 : 0x4, true); // front left+right, or front centre
      dv.setUint16(44, this.formatTag, true);
      out.set(SUBFORMAT_GUID_TAIL, 46);
      p = 60;
    }
    writeAscii(out, p, 'data');
    dv.setUint32(p + 4, dataBytes, true);
    return out;
  }

  /** Encode one block of samples (interleaved channels for two); bytes of the data chunk. */
  encode(values: Float32Array): Uint8Array {
    return this.encoder.encode(values);
  }

  /** The pad byte that closes an odd-sized data chunk (empty when none is needed). */
  trailer(): Uint8Array {
    return new Uint8Array((this.encoder.samplesEncoded * this.blockAlign) % 2);
  }
}

/** A whole WAV file in memory (tests, small exports). */
export function encodeWav(spec: WavSpec, values: Float32Array): Uint8Array {
  const writer = new WavWriter(spec);
  const data = writer.encode(values);
  const frames = values.length / spec.channels;
  const head = writer.header(frames);
  const tail = writer.trailer();
  const out = new Uint8Array(head.length + data.length + tail.length);
  out.set(head, 0);
  out.set(data, head.length);
  out.set(tail, head.length + data.length);
  return out;
}

function writeAscii(out: Uint8Array, at: number, text: string): void {
  for (let k = 0; k < text.length; k++) out[at + k] = text.charCodeAt(k);
}
