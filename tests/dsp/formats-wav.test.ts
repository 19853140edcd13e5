/**
 * WAV reading and writing. Test files are assembled here byte by byte from the RIFF/WAVE layout in
 * Microsoft/IBM, "Multimedia Programming Interface and Data Specifications 1.0" (1991): "RIFF",
 * size, "WAVE", then chunks of id + little-endian size + body, a pad byte after odd-sized bodies;
 * `fmt ` = format tag, channels, samples per second, average bytes per second, block align, bits
 * per sample; 8-bit PCM unsigned, wider PCM signed. WAVE_FORMAT_EXTENSIBLE follows Microsoft,
 * "Multiple Channel Audio Data and WAVE Files" (2007): cbSize 22, valid bits, channel mask, and a
 * SubFormat GUID whose first two bytes are the real format tag.
 */
import { describe, expect, it } from 'vitest';
import { WavReader, WavWriter, encodeWav, type WavSampleFormat } from '@/dsp/formats';
import { concatFloat, randomSplit, rng } from './formats-helpers';

interface Build {
  tag?: number; channels?: number; rate?: number; bits?: number; extensible?: boolean;
  data: number[]; before?: [string, number[]][]; after?: [string, number[]][];
  riffSize?: number; blockAlign?: number; byteRate?: number; dataSize?: number; omitFmt?: boolean;
}

function u16(v: number): number[] { return [v & 0xff, (v >> 8) & 0xff]; }
function u32(v: number): number[] { return [v & 0xff, (v >>> 8) & 0xff, (v >>> 16) & 0xff, (v >>> 24) & 0xff]; }
function id(s: string): number[] { return [...s].map((c) => c.charCodeAt(0)); }
function chunk(name: string, body: number[], declared = body.length): number[] {
  return [...id(name), ...u32(declared), ...body, ...(body.length % 2 ? [0] : [])];
}

/** A WAV file straight from the spec's byte layout (independent of our writer). */
function buildWav(b: Build): Uint8Array {
  const channels = b.channels ?? 1, rate = b.rate ?? 8000, bits = b.bits ?? 16, tag = b.tag ?? 1;
  const blockAlign = b.blockAlign ?? channels * bits / 8;
  let fmt = [...u16(b.extensible ? 0xfffe : tag), ...u16(channels), ...u32(rate), ...u32(b.byteRate ?? rate * blockAlign), ...u16(blockAlign), ...u16(bits)];
  if (b.extensible) {
    fmt = [...fmt, ...u16(22), ...u16(bits), ...u32(channels === 2 ? 3 : 4), ...u16(tag),
      0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];
  }
  const body = [
    ...id('WAVE'),
    ...(b.before ?? []).flatMap(([n, d]) => chunk(n, d)),
    ...(b.omitFmt ? [] : chunk('fmt ', fmt)),
    ...chunk('data', b.data, b.dataSize ?? b.data.length),
    ...(b.after ?? []).flatMap(([n, d]) => chunk(n, d)),
  ];
  return Uint8Array.from([...id('RIFF'), ...u32(b.riffSize ?? body.length), ...body]);
}

function readAll(bytes: Uint8Array, seed = 1, options = {}): { reader: WavReader; values: Float32Array } {
  const reader = new WavReader(options);
  const blocks = randomSplit(bytes, rng(seed), 13).map((block) => reader.push(block));
  reader.end();
  return { reader, values: concatFloat(blocks) };
}

describe('WAV reader on files built from the spec', () => {
  it('16-bit PCM mono, with an odd-sized LIST chunk before and after data', () => {
    const bytes = buildWav({ data: [0x00, 0x80, 0xff, 0x7f, 0x00, 0x40], before: [['LIST', [1, 2, 3]]], after: [['junk', [9]]] });
    for (const seed of [1, 2, 3, 4]) {
      const { reader, values } = readAll(bytes, seed);
      expect(reader.format).toMatchObject({ formatTag: 1, channels: 1, sampleRate: 8000, bitsPerSample: 16 });
      expect(reader.layout).toBe('real');
      expect(Array.from(values)).toEqual([-1, 32767 / 32768, 0.5].map(Math.fround));
    }
  });

  it('8-bit PCM is unsigned, an odd data chunk is padded', () => {
    const bytes = buildWav({ bits: 8, data: [0, 128, 255], after: [['note', [1, 2]]] });
    const { values, reader } = readAll(bytes);
    expect(reader.declaredFrames).toBe(3);
    expect(Array.from(values)).toEqual([-1, 0, 127 / 128].map(Math.fround));
  });

  it('24-bit PCM stereo reads as real-pair, or complex when asked', () => {
    // frame 0: L = 0x800000 (-1.0), R = 0x400000 (0.5); frame 1: L = 0xffffff (-1/2^23), R = 0
    const data = [0x00, 0x00, 0x80, 0x00, 0x00, 0x40, 0xff, 0xff, 0xff, 0, 0, 0];
    const bytes = buildWav({ bits: 24, channels: 2, data });
    const { reader, values } = readAll(bytes);
    expect(reader.layout).toBe('real-pair');
    expect(Array.from(values)).toEqual([-1, 0.5, -1 / 2 ** 23, 0].map(Math.fround));
    expect(readAll(bytes, 5, { asComplex: true }).reader.layout).toBe('complex');
  });

  it('32-bit PCM and 32-bit IEEE float', () => {
    const pcm = buildWav({ bits: 32, data: [...u32(0x40000000), ...u32(0xc0000000)] });
    expect(Array.from(readAll(pcm).values)).toEqual([0.5, -0.5]);
    const f = new Float32Array([0.25, -0.125]);
    const flt = buildWav({ tag: 3, bits: 32, data: [...new Uint8Array(f.buffer)] });
    expect(Array.from(readAll(flt).values)).toEqual([0.25, -0.125]);
  });

  it('WAVE_FORMAT_EXTENSIBLE with PCM and float sub-formats', () => {
    const pcm = buildWav({ extensible: true, bits: 24, channels: 2, data: [0, 0, 0x40, 0, 0, 0xc0] });
    const r = readAll(pcm);
    expect(r.reader.format).toMatchObject({ extensible: true, formatTag: 1 });
    expect(Array.from(r.values)).toEqual([0.5, -0.5]);
    const f = new Float32Array([0.75]);
    const flt = buildWav({ extensible: true, tag: 3, bits: 32, data: [...new Uint8Array(f.buffer)] });
    expect(Array.from(readAll(flt).values)).toEqual([0.75]);
  });
});

describe('WAV writer', () => {
  const formats: [WavSampleFormat, number][] = [['pcm8', 1 / 256], ['pcm16', 1 / 65536], ['pcm24', 2 ** -24], ['pcm32', 2 ** -24], ['float32', 0]];
  for (const [sampleFormat, tol] of formats) {
    for (const channels of [1, 2] as const) {
      for (const extensible of [false, true]) {
        it(`${sampleFormat}, ${channels} channel(s)${extensible ? ', extensible' : ''}: write then read`, () => {
          const random = rng(channels * 31 + sampleFormat.length);
          const values = Float32Array.from({ length: channels * 257 }, () => (random() * 2 - 1) * 0.99);
          const bytes = encodeWav({ sampleRate: 48000, channels, sampleFormat, extensible }, values);
          expect(bytes.length % 2).toBe(0); // RIFF word alignment: pcm8 mono has an odd data chunk
          const { reader, values: back } = readAll(bytes, 9);
          expect(reader.format).toMatchObject({ sampleRate: 48000, channels, extensible });
          expect(back.length).toBe(values.length);
          let worst = 0;
          for (let k = 0; k < values.length; k++) worst = Math.max(worst, Math.abs(back[k] - values[k]));
          expect(worst).toBeLessThanOrEqual(tol * 1.0001);
        });
      }
    }
  }

  it('writes the header fields the spec lays out', () => {
    const w = new WavWriter({ sampleRate: 10000, channels: 2, sampleFormat: 'pcm16' });
    const h = Buffer.from(w.header(100));
    expect(h.toString('latin1', 0, 4)).toBe('RIFF');
    expect(h.readUInt32LE(4)).toBe(36 + 400);
    expect(h.toString('latin1', 8, 16)).toBe('WAVEfmt ');
    expect([h.readUInt16LE(20), h.readUInt16LE(22), h.readUInt32LE(24), h.readUInt32LE(28), h.readUInt16LE(32), h.readUInt16LE(34)])
      .toEqual([1, 2, 10000, 40000, 4, 16]);
    expect(h.toString('latin1', 36, 40)).toBe('data');
    expect(h.readUInt32LE(40)).toBe(400);
  });

  it('refuses a zero or fractional sample rate', () => {
    expect(() => new WavWriter({ sampleRate: 0, channels: 1, sampleFormat: 'pcm16' })).toThrow(/sampleRate: must be a positive/);
    expect(() => new WavWriter({ sampleRate: -8000, channels: 1, sampleFormat: 'pcm16' })).toThrow(/sampleRate/);
  });
});

describe('bad WAV input: clear errors naming the problem', () => {
  const good = { data: [1, 2, 3, 4, 5, 6, 7, 8] };
  const expectError = (bytes: Uint8Array, pattern: RegExp) => expect(() => readAll(bytes)).toThrow(pattern);

  it('truncated data', () => expectError(buildWav(good).subarray(0, 48), /truncated: data chunk declares 8 bytes but the file ends after 4/));
  it('truncated header', () => expectError(buildWav(good).subarray(0, 20), /truncated: file ends before the fmt chunk/));
  it('a file too short to be WAV', () => expectError(Uint8Array.from([0x52, 0x49]), /too short for a RIFF\/WAVE header/));
  it('not RIFF', () => expectError(new TextEncoder().encode('ID3\u0004 some mp3 bytes here'), /not a WAV file/));
  it('lying block align', () => expectError(buildWav({ ...good, blockAlign: 4 }), /fmt.blockAlign: 4 does not match 1 channel\(s\) x 16 bits = 2 bytes/));
  it('lying byte rate', () => expectError(buildWav({ ...good, byteRate: 1234 }), /fmt.byteRate: 1234 does not match/));
  it('data chunk larger than the RIFF size', () => expectError(buildWav({ ...good, dataSize: 800 }), /data.size.*declares 800 bytes, more than the 8 left/));
  it('data size not whole frames', () => expectError(buildWav({ data: [1, 2, 3], channels: 1, bits: 16 }), /data.size: 3 bytes is not a whole number of 2-byte frames/));
  it('RIFF size longer than the file', () => expectError(buildWav({ ...good, riffSize: 400, after: [] }), /truncated: RIFF header declares 408 bytes but the file ends after 52/));
  it('unknown format tag', () => expectError(buildWav({ ...good, tag: 2 }), /format tag 0x0002 is not supported/));
  it('three channels', () => expectError(buildWav({ ...good, channels: 3, bits: 16, data: [1, 2, 3, 4, 5, 6] }), /fmt.channels: 3 channels/));
  it('zero sample rate', () => expectError(buildWav({ ...good, rate: 0 }), /fmt.sampleRate: must be > 0 Hz, got 0/));
  it('data before fmt', () => expectError(buildWav({ ...good, omitFmt: true }), /data chunk comes before the fmt chunk/));
  it('no data chunk', () => {
    const bytes = buildWav(good);
    expectError(bytes.subarray(0, 36).map((v, k) => (k === 4 ? 28 : k < 5 || k > 7 ? v : 0)), /no data chunk/);
  });
});
