/**
 * SigMF datatypes, full-scale conventions and the streaming sample decoder/encoder.
 * Reference bytes come from Node's Buffer readers (an implementation independent of ours) and the
 * datatype rules of the SigMF v1.2 specification (GNU Radio Foundation, 2024, "Dataset Format").
 */
import { describe, expect, it } from 'vitest';
import {
  FormatError, SIGMF_DATATYPES, SampleDecoder, SampleEncoder, formatDatatype, parseDatatype,
  quantisationTolerance, layoutFromDatatype, parseLayout, checkLayoutFits,
} from '@/dsp/formats';
import type { SampleType } from '@/dsp/types';
import { concatBytes, concatFloat, randomSplit, rng } from './formats-helpers';

describe('SigMF datatype strings', () => {
  it('knows all 28 SigMF datatypes and round-trips their names', () => {
    // SigMF v1.2: {r,c} x {f32,f64,i32,i16,u32,u16} x {_le,_be} plus {r,c} x {i8,u8} = 28.
    expect(SIGMF_DATATYPES).toHaveLength(28);
    for (const name of SIGMF_DATATYPES) {
      const dt = parseDatatype(name);
      expect(formatDatatype(dt, dt.complex)).toBe(name);
    }
  });

  it('reads the parts of a datatype', () => {
    expect(parseDatatype('cf32_le')).toMatchObject({ complex: true, kind: 'f', bits: 32, littleEndian: true });
    expect(parseDatatype('ri16_be')).toMatchObject({ complex: false, kind: 'i', bits: 16, littleEndian: false });
    expect(parseDatatype('cu8')).toMatchObject({ complex: true, kind: 'u', bits: 8 });
  });

  it.each(['cf16_le', 'ci8_le', 'cf32', 'xf32_le', 'CF32_LE', 'ci24_le', ''])('rejects unknown datatype %j naming it', (name) => {
    expect(() => parseDatatype(name)).toThrow(FormatError);
    expect(() => parseDatatype(name)).toThrow(new RegExp(`unknown datatype "${name}"`));
  });

  it('maps datatype and channel count to a layout', () => {
    expect(layoutFromDatatype(parseDatatype('cf32_le'))).toBe('complex');
    expect(layoutFromDatatype(parseDatatype('ri16_le'), 1)).toBe('real');
    expect(layoutFromDatatype(parseDatatype('ri16_le'), 2)).toBe('real-pair');
    expect(() => layoutFromDatatype(parseDatatype('ri16_le'), 3)).toThrow(/core:num_channels: 3 real channels/);
    expect(() => parseLayout('iq')).toThrow(/layout: unknown layout "iq"/);
    expect(() => checkLayoutFits('complex', parseDatatype('rf32_le'))).toThrow(/needs a c datatype/);
  });
});

describe('integer full scale (full-scale.ts)', () => {
  // Each case: datatype, bytes, expected values. Expected values follow the stated convention
  // (signed: code / 2^(N-1); unsigned: (code - 2^(N-1)) / 2^(N-1)); the codes come from Buffer.
  const cases: [string, number[], (buf: Buffer) => number[]][] = [
    ['ri8', [0x80, 0x7f, 0x00], (b) => [b.readInt8(0) / 128, b.readInt8(1) / 128, b.readInt8(2) / 128]],
    ['ru8', [0x00, 0x80, 0xff], (b) => [(b.readUInt8(0) - 128) / 128, (b.readUInt8(1) - 128) / 128, (b.readUInt8(2) - 128) / 128]],
    ['ri16_le', [0x00, 0x80, 0xff, 0x7f], (b) => [b.readInt16LE(0) / 32768, b.readInt16LE(2) / 32768]],
    ['ri16_be', [0x80, 0x00, 0x7f, 0xff], (b) => [b.readInt16BE(0) / 32768, b.readInt16BE(2) / 32768]],
    ['ru16_le', [0x00, 0x00, 0x00, 0x80], (b) => [(b.readUInt16LE(0) - 32768) / 32768, (b.readUInt16LE(2) - 32768) / 32768]],
    ['ru16_be', [0xff, 0xff, 0x80, 0x01], (b) => [(b.readUInt16BE(0) - 32768) / 32768, (b.readUInt16BE(2) - 32768) / 32768]],
    ['ri32_le', [0, 0, 0, 0x80, 0, 0, 0, 0x40], (b) => [b.readInt32LE(0) / 2 ** 31, b.readInt32LE(4) / 2 ** 31]],
    ['ri32_be', [0x40, 0, 0, 0, 0xc0, 0, 0, 0], (b) => [b.readInt32BE(0) / 2 ** 31, b.readInt32BE(4) / 2 ** 31]],
    ['ru32_le', [0, 0, 0, 0xc0], (b) => [(b.readUInt32LE(0) - 2 ** 31) / 2 ** 31]],
    ['ru32_be', [0x40, 0, 0, 0], (b) => [(b.readUInt32BE(0) - 2 ** 31) / 2 ** 31]],
    ['rf32_be', [0x3f, 0x00, 0x00, 0x00], (b) => [b.readFloatBE(0)]],
    ['rf64_be', [0xbf, 0xd0, 0, 0, 0, 0, 0, 0], (b) => [b.readDoubleBE(0)]],
  ];
  it.each(cases)('%s decodes known codes', (name, bytes, expected) => {
    const dec = new SampleDecoder(parseDatatype(name), 'real');
    const out = dec.decode(Uint8Array.from(bytes));
    expect(Array.from(out)).toEqual(expected(Buffer.from(bytes)).map(Math.fround));
  });

  it('puts the extremes where the convention says', () => {
    // common practice: most negative signed code is exactly -1.0; u8 128 is 0.0.
    expect(new SampleDecoder(parseDatatype('ri16_le'), 'real').decode(Uint8Array.from([0x00, 0x80]))[0]).toBe(-1);
    expect(new SampleDecoder(parseDatatype('ru8'), 'real').decode(Uint8Array.from([128]))[0]).toBe(0);
    const enc = new SampleEncoder(parseDatatype('ri16_le'), 'real');
    const bytes = enc.encode(Float32Array.from([1, -1, 2, 0.5]));
    const b = Buffer.from(bytes);
    expect([b.readInt16LE(0), b.readInt16LE(2), b.readInt16LE(4), b.readInt16LE(6)]).toEqual([32767, -32768, 32767, 16384]);
    expect(enc.clippedValues).toBe(2); // +1.0 and 2.0 lie above the largest code
  });
});

const LAYOUTS_FOR: (name: string) => SampleType[] = (name) => (name.startsWith('c') ? ['complex'] : ['real', 'real-pair']);

describe('round trips: write then read gives the same samples within quantisation', () => {
  for (const name of SIGMF_DATATYPES) {
    for (const layout of LAYOUTS_FOR(name)) {
      it(`${name} as ${layout}, random block sizes`, () => {
        const dt = parseDatatype(name);
        const random = rng(name.length * 7919 + layout.length);
        const values = new Float32Array(2 * 501);
        for (let k = 0; k < values.length; k++) values[k] = (random() * 2 - 1) * 0.99; // stay below the top code so nothing clips
        const enc = new SampleEncoder(dt, layout);
        // Encode in random value-block sizes too (whole samples each).
        const chunks: Uint8Array[] = [];
        const vps = layout === 'real' ? 1 : 2;
        for (let p = 0; p < values.length;) {
          const n = Math.min(values.length - p, vps * Math.floor(random() * 40));
          chunks.push(enc.encode(values.subarray(p, p + n)).slice());
          p += n;
        }
        const bytes = concatBytes(chunks);
        expect(bytes.length).toBe(values.length * (dt.bits / 8));
        const dec = new SampleDecoder(dt, layout);
        const blocks = randomSplit(bytes, random).map((b) => dec.decode(b));
        dec.end();
        const back = concatFloat(blocks);
        expect(back.length).toBe(values.length);
        expect(dec.samplesDecoded).toBe(values.length / vps);
        const tol = quantisationTolerance(dt);
        let worst = 0;
        for (let k = 0; k < values.length; k++) worst = Math.max(worst, Math.abs(back[k] - values[k]));
        expect(worst).toBeLessThanOrEqual(tol * 1.0001);
      });
    }
  }

  it('zero-copy cf32_le decoding returns a view when aligned and the same values', () => {
    const values = Float32Array.from({ length: 64 }, (_, k) => Math.sin(k));
    const bytes = new Uint8Array(values.buffer);
    const dec = new SampleDecoder(parseDatatype('cf32_le'), 'complex', { zeroCopy: true });
    const out = dec.decode(bytes);
    expect(out.buffer).toBe(values.buffer);
    expect(Array.from(out)).toEqual(Array.from(values));
  });
});

describe('bad sample data', () => {
  it('a partial trailing sample is an error at end()', () => {
    const dec = new SampleDecoder(parseDatatype('ci16_le'), 'complex');
    expect(dec.decode(new Uint8Array(10)).length).toBe(4); // 2 samples of 4 bytes, 2 bytes carried
    expect(() => dec.end()).toThrow(/2 trailing byte\(s\) after sample 2 do not make a whole sample of 4 bytes/);
  });

  it.each([NaN, Infinity, -Infinity])('%s in float data names the sample index', (bad) => {
    const values = new Float32Array(20);
    values[13] = bad; // sample 6, Q
    const bytes = new Uint8Array(values.buffer);
    const dec = new SampleDecoder(parseDatatype('cf32_le'), 'complex');
    expect(() => { for (const b of randomSplit(bytes, rng(3), 7)) dec.decode(b); }).toThrow(/sample 6 \(Q\) is (NaN|-?Infinity)/);
  });

  it('NaN in f64 big-endian data is found as well', () => {
    const buf = Buffer.alloc(24);
    buf.writeDoubleBE(0.25, 0); buf.writeDoubleBE(NaN, 8); buf.writeDoubleBE(0, 16);
    const dec = new SampleDecoder(parseDatatype('rf64_be'), 'real');
    expect(() => dec.decode(new Uint8Array(buf))).toThrow(/sample 1 is NaN/);
  });

  it('the encoder refuses NaN and partial samples', () => {
    const enc = new SampleEncoder(parseDatatype('ci16_le'), 'complex');
    expect(() => enc.encode(Float32Array.from([0, 0, 0, NaN]))).toThrow(/sample 1 is NaN/);
    expect(() => enc.encode(new Float32Array(3))).toThrow(/not a whole number of complex samples/);
  });
});
