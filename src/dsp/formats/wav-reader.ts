/**
 * Streaming WAV reader: byte blocks of any size in, float32 sample blocks out. Checks the header
 * against itself and against the bytes that actually arrive, so a truncated file or a lying
 * header becomes a FormatError naming the field instead of silent garbage. Layout facts and
 * sources: wav-format.ts.
 */
import type { SampleType } from '../types';
import { FormatError } from './datatype';
import { SampleDecoder } from './sample-decoder';
import {
  SUBFORMAT_GUID_TAIL, WAVE_FORMAT_EXTENSIBLE, WAVE_FORMAT_IEEE_FLOAT, WAVE_FORMAT_PCM,
  wavEncoding, wavLayout, type WavFormat,
} from './wav-format';

export interface WavReaderOptions {
  /** Treat a two-channel WAV as complex I (left) / Q (right) instead of real-pair. */
  asComplex?: boolean;
  /** See SampleDecoderOptions.zeroCopy. */
  zeroCopy?: boolean;
}

type State = 'riff' | 'chunk-header' | 'fmt-body' | 'skip' | 'data' | 'done';

const MAX_FMT_BYTES = 1024;

/** Reads one WAV stream; `format` and `layout` are known once the `fmt ` chunk has passed. */
export class WavReader {
  format: WavFormat | null = null;
  layout: SampleType | null = null;
  /** Byte count the data chunk declares. */
  dataBytes: number | null = null;
  private readonly options: WavReaderOptions;
  private state: State = 'riff';
  private head = new Uint8Array(12);
  private headLength = 0;
  private headNeed = 12;
  private position = 0;
  private riffEnd = 0;
  private skipRemaining = 0;
  private dataRemaining = 0;
  private dataChunkSeen = false;
  private decoder: SampleDecoder | null = null;
  private skipThenDone = false;
  private pendingPad = false;
  private pendingFmtPad = 0;

  constructor(options: WavReaderOptions = {}) {
    this.options = options;
  }

  /** Frames (samples per channel) the header promises, once the data chunk header is read. */
  get declaredFrames(): number | null {
    return this.dataBytes === null || !this.format ? null : this.dataBytes / this.format.blockAlign;
  }

  /** Feed the next byte block; returns the samples it completes (empty until the data chunk). */
  push(bytes: Uint8Array): Float32Array {
    let out: Float32Array | null = null;
    let p = 0;
    while (p < bytes.length) {
      if (this.state === 'done') {
        this.position += bytes.length - p; // bytes past the RIFF size are not part of the file
        break;
      }
      if (this.state === 'skip' || this.state === 'data') {
        const want = this.state === 'skip' ? this.skipRemaining : this.dataRemaining;
        const take = Math.min(want, bytes.length - p);
        if (this.state === 'data') {
          out = this.decoder!.decode(bytes.subarray(p, p + take));
          this.dataRemaining -= take;
        } else {
          this.skipRemaining -= take;
        }
        p += take;
        this.position += take;
        if (want === take) this.afterBody();
        continue;
      }
      const take = Math.min(this.headNeed - this.headLength, bytes.length - p);
      this.head.set(bytes.subarray(p, p + take), this.headLength);
      this.headLength += take;
      p += take;
      this.position += take;
      if (this.headLength === this.headNeed) this.onHead();
    }
    return out ?? new Float32Array(0);
  }

  /** End of stream: throws FormatError if the file stopped short of what its header declares. */
  end(): void {
    if (!this.format && this.state !== 'done') {
      throw new FormatError(
        this.position < 12 ? `truncated: ${this.position} bytes is too short for a RIFF/WAVE header` : 'truncated: file ends before the fmt chunk',
        'riff',
        { code: 'truncated' },
      );
    }
    if (!this.format) throw new FormatError('fmt: no fmt chunk before the end of the RIFF data', 'fmt');
    if (!this.dataChunkSeen) throw new FormatError('data: no data chunk in the file', 'data');
    if (this.state === 'data' && this.dataRemaining > 0) {
      throw new FormatError(
        `truncated: data chunk declares ${this.dataBytes} bytes but the file ends after ${this.dataBytes! - this.dataRemaining}`,
        'data',
        { code: 'truncated' },
      );
    }
    // A missing final pad byte is tolerated: many writers omit it and no data is lost.
    const missing = this.riffEnd - this.position;
    if (this.state !== 'done' && missing > 1) {
      throw new FormatError(`truncated: RIFF header declares ${this.riffEnd} bytes but the file ends after ${this.position}`, 'riff.size', { code: 'truncated' });
    }
    this.decoder?.end();
  }

  private expectHead(n: number, state: State): void {
    if (this.head.length < n) this.head = new Uint8Array(n);
    this.headLength = 0;
    this.headNeed = n;
    this.state = state;
  }

  private nextChunkOrDone(): void {
    const remaining = this.riffEnd - this.position;
    if (remaining >= 8) {
      this.expectHead(8, 'chunk-header');
    } else if (remaining > 0) {
      // Too few bytes for another chunk (a final pad byte, say): consume them, then stop.
      this.skipRemaining = remaining;
      this.skipThenDone = true;
      this.state = 'skip';
    } else {
      this.state = 'done';
    }
  }

  private afterBody(): void {
    if (this.state === 'skip' && this.skipThenDone) {
      this.skipThenDone = false;
      this.state = 'done';
      return;
    }
    if (this.state === 'data' && this.pendingPad) {
      this.pendingPad = false;
      this.skipRemaining = 1;
      this.state = 'skip';
      return;
    }
    this.nextChunkOrDone();
  }

  private onHead(): void {
    const h = this.head;
    const dv = new DataView(h.buffer, h.byteOffset, this.headNeed);
    if (this.state === 'riff') {
      const id = ascii(h, 0, 4);
      if (id === 'RF64') throw new FormatError('riff: RF64 (64-bit WAV) is not supported', 'riff');
      if (id !== 'RIFF') throw new FormatError(`riff: not a WAV file (starts with "${printable(id)}", expected "RIFF")`, 'riff');
      if (ascii(h, 8, 4) !== 'WAVE') throw new FormatError(`riff: form type is "${printable(ascii(h, 8, 4))}", expected "WAVE"`, 'riff.form');
      const size = dv.getUint32(4, true);
      if (size < 4) throw new FormatError(`riff.size: ${size} is too small for a WAVE file`, 'riff.size');
      this.riffEnd = 8 + size;
      this.nextChunkOrDone();
      return;
    }
    if (this.state === 'chunk-header') {
      const id = ascii(h, 0, 4);
      const size = dv.getUint32(4, true);
      const pad = size % 2;
      if (this.position + size > this.riffEnd) {
        throw new FormatError(
          `${chunkField(id)}.size: chunk "${printable(id)}" declares ${size} bytes, more than the ${this.riffEnd - this.position} left in the RIFF size (lying header)`,
          `${chunkField(id)}.size`,
        );
      }
      if (id === 'fmt ') {
        if (this.format) throw new FormatError('fmt: a second fmt chunk', 'fmt');
        if (size < 16 || size > MAX_FMT_BYTES) throw new FormatError(`fmt.size: ${size} bytes is not a valid fmt chunk size (16..${MAX_FMT_BYTES})`, 'fmt.size');
        this.pendingFmtPad = pad;
        this.expectHead(size, 'fmt-body');
        return;
      }
      if (id === 'data' && !this.dataChunkSeen) {
        if (!this.format) throw new FormatError('data: data chunk comes before the fmt chunk', 'data');
        if (size % this.format.blockAlign !== 0) {
          throw new FormatError(
            `data.size: ${size} bytes is not a whole number of ${this.format.blockAlign}-byte frames (lying header)`,
            'data.size',
          );
        }
        this.dataChunkSeen = true;
        this.dataBytes = size;
        this.dataRemaining = size;
        this.pendingPad = pad === 1;
        this.decoder = new SampleDecoder(this.format.encoding, this.layout!, { zeroCopy: this.options.zeroCopy });
        this.state = 'data';
        if (size === 0) this.afterBody();
        return;
      }
      this.skipRemaining = size + pad;
      this.state = 'skip';
      if (this.skipRemaining === 0) this.afterBody();
      return;
    }
    if (this.state === 'fmt-body') {
      this.parseFmt(dv);
      this.skipRemaining = this.pendingFmtPad;
      this.state = 'skip';
      if (this.skipRemaining === 0) this.afterBody();
    }
  }

  private parseFmt(dv: DataView): void {
    const size = dv.byteLength;
    let formatTag = dv.getUint16(0, true);
    const channels = dv.getUint16(2, true);
    const sampleRate = dv.getUint32(4, true);
    const byteRate = dv.getUint32(8, true);
    const blockAlign = dv.getUint16(12, true);
    const bitsPerSample = dv.getUint16(14, true);
    let extensible = false;
    if (formatTag === WAVE_FORMAT_EXTENSIBLE) {
      extensible = true;
      if (size < 40) throw new FormatError(`fmt.size: extensible format needs 40 bytes, chunk has ${size}`, 'fmt.size');
      const cbSize = dv.getUint16(16, true);
      if (cbSize < 22) throw new FormatError(`fmt.cbSize: ${cbSize} is too small for WAVE_FORMAT_EXTENSIBLE (22)`, 'fmt.cbSize');
      const validBits = dv.getUint16(18, true);
      if (validBits > bitsPerSample) {
        throw new FormatError(`fmt.validBitsPerSample: ${validBits} exceeds the container's ${bitsPerSample} bits`, 'fmt.validBitsPerSample');
      }
      formatTag = dv.getUint16(24, true);
      for (let k = 0; k < 14; k++) {
        if (dv.getUint8(26 + k) !== SUBFORMAT_GUID_TAIL[k]) {
          throw new FormatError('fmt.subFormat: unknown SubFormat GUID (only PCM and IEEE float are supported)', 'fmt.subFormat');
        }
      }
      if (formatTag !== WAVE_FORMAT_PCM && formatTag !== WAVE_FORMAT_IEEE_FLOAT) {
        throw new FormatError(`fmt.subFormat: format 0x${formatTag.toString(16)} is not supported (PCM or IEEE float)`, 'fmt.subFormat');
      }
    }
    if (channels !== 1 && channels !== 2) throw new FormatError(`fmt.channels: ${channels} channels are not supported (1 or 2)`, 'fmt.channels');
    if (sampleRate <= 0) throw new FormatError(`fmt.sampleRate: must be > 0 Hz, got ${sampleRate}`, 'fmt.sampleRate');
    const encoding = wavEncoding(formatTag, bitsPerSample);
    const expectedAlign = channels * (bitsPerSample / 8);
    if (blockAlign !== expectedAlign) {
      throw new FormatError(
        `fmt.blockAlign: ${blockAlign} does not match ${channels} channel(s) x ${bitsPerSample} bits = ${expectedAlign} bytes (lying header)`,
        'fmt.blockAlign',
      );
    }
    if (byteRate !== sampleRate * blockAlign) {
      throw new FormatError(
        `fmt.byteRate: ${byteRate} does not match ${sampleRate} Hz x ${blockAlign} bytes = ${sampleRate * blockAlign} (lying header)`,
        'fmt.byteRate',
      );
    }
    this.format = { formatTag, extensible, channels: channels as 1 | 2, sampleRate, bitsPerSample, blockAlign, encoding };
    this.layout = wavLayout(channels, this.options.asComplex ?? false);
  }
}

function ascii(bytes: Uint8Array, start: number, length: number): string {
  return String.fromCharCode(...bytes.subarray(start, start + length));
}

function printable(text: string): string {
  return text.replace(/[^\x20-\x7e]/g, '?');
}

function chunkField(id: string): string {
  return id === 'data' ? 'data' : id === 'fmt ' ? 'fmt' : `chunk "${printable(id)}"`;
}
