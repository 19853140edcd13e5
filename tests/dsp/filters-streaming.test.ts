import { describe, expect, it } from 'vitest';
import { BiquadCascade, FirDecimator, FirFilter, designIir, windowedSincTaps } from '@/dsp/filters';
import { loadFilterFixture, maxAbsoluteError, randomSplit } from './filters-fixtures';

interface FilteringCase {
  kind: 'lfilter' | 'lfilter-complex' | 'upfirdn' | 'upfirdn-real' | 'sosfilt';
  name?: string;
  taps?: number[];
  sos?: number[][];
  factor?: number;
  input?: number[];
  output?: number[];
  inputRe?: number[];
  inputIm?: number[];
  outputRe?: number[];
  outputIm?: number[];
}

const interleave = (re: number[], im: number[]) => {
  const out = new Float32Array(2 * re.length);
  re.forEach((v, i) => {
    out[2 * i] = v;
    out[2 * i + 1] = im[i];
  });
  return out;
};

/** Run a block processor over `input` cut into blocks of the given sample counts; concatenate. */
function runSplit(processor: { process(b: Float32Array): Float32Array }, input: Float32Array, sizes: number[], valuesPerSample: number): Float32Array {
  const parts: Float32Array[] = [];
  let at = 0;
  for (const n of sizes) {
    parts.push(processor.process(input.slice(at, at + n * valuesPerSample)).slice());
    at += n * valuesPerSample;
  }
  const out = new Float32Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

// Float32 output of float64 arithmetic on values of order 1: 1e-5 covers the final rounding.
const FLOAT32_TOLERANCE = 1e-5;

describe('streaming filters against SciPy (SciPy reference vectors)', () => {
  const fixture = loadFilterFixture<FilteringCase>('filtering.json');

  for (const c of fixture.cases) {
    const label = `${c.kind}${c.name ? ` ${c.name}` : ''}${c.factor ? ` factor ${c.factor}, ${c.taps!.length} taps` : ''}`;
    it(`${label} matches SciPy in one block and in random blocks`, () => {
      let make: () => { process(b: Float32Array): Float32Array };
      let input: Float32Array;
      let expected: Float32Array;
      let vps: number;
      if (c.kind === 'lfilter' || c.kind === 'upfirdn-real' || (c.kind === 'sosfilt')) {
        input = Float32Array.from(c.input!);
        vps = 1;
        const n = c.kind === 'upfirdn-real' ? Math.ceil(c.input!.length / c.factor!) : c.input!.length;
        // upfirdn returns the whole convolution; the stream keeps the outputs that fall within the input.
        expected = Float32Array.from(c.output!.slice(0, n));
        make = c.kind === 'sosfilt' ? () => new BiquadCascade(c.sos!, 1) : () => new FirDecimator(c.taps!, c.factor ?? 1, 1);
      } else {
        input = interleave(c.inputRe!, c.inputIm!);
        vps = 2;
        const n = c.kind === 'upfirdn' ? Math.ceil(c.inputRe!.length / c.factor!) : c.inputRe!.length;
        expected = interleave(c.outputRe!.slice(0, n), c.outputIm!.slice(0, n));
        make = c.kind === 'upfirdn' ? () => new FirDecimator(c.taps!, c.factor!, 2) : () => new FirFilter(c.taps!, 2);
      }
      const whole = make().process(input).slice();
      expect(whole.length).toBe(expected.length);
      expect(maxAbsoluteError(whole, expected)).toBeLessThan(FLOAT32_TOLERANCE);
      for (const seed of [1, 2, 3]) {
        const split = runSplit(make(), input, randomSplit(input.length / vps, 97, seed), vps);
        // Identical, not just close: state is carried exactly across block edges.
        expect(split).toEqual(whole);
      }
    });
  }
});

describe('block-size invariance on long streams', () => {
  const noise = (n: number, seed: number) => {
    let s = seed;
    return Float32Array.from({ length: n }, () => {
      s = (s * 1103515245 + 12345) % 2147483648;
      return s / 1073741824 - 1;
    });
  };
  const taps = windowedSincTaps({ response: 'lowpass', taps: 127, window: 'hamming', cutoff: 400e3, sampleRate: 10e6 });

  it('polyphase decimator (127 taps, factor 8, complex): any split gives identical output', () => {
    const input = noise(2 * 20000, 11);
    const whole = new FirDecimator(taps, 8, 2).process(input).slice();
    expect(whole.length).toBe(2 * Math.ceil(20000 / 8));
    for (const [seed, max] of [[5, 3], [6, 50], [7, 5000]]) {
      expect(runSplit(new FirDecimator(taps, 8, 2), input, randomSplit(20000, max, seed), 2)).toEqual(whole);
    }
    // Single samples at a time, too.
    expect(runSplit(new FirDecimator(taps, 8, 2), input.slice(0, 2 * 500), new Array(500).fill(1), 2)).toEqual(whole.slice(0, 2 * 63));
  });

  it('FIR filter (real and complex): any split gives identical output', () => {
    for (const channels of [1, 2] as const) {
      const input = noise(channels * 9000, 21 + channels);
      const whole = new FirFilter(taps, channels).process(input).slice();
      expect(whole.length).toBe(input.length);
      expect(runSplit(new FirFilter(taps, channels), input, randomSplit(9000, 300, 9), channels)).toEqual(whole);
    }
  });

  it('biquad cascade (real and complex): any split gives identical output', () => {
    const sos = designIir({ family: 'chebyshev1', response: 'bandpass', order: 5, ripple: 0.5, low: 1000, high: 3000, sampleRate: 16000 });
    for (const channels of [1, 2] as const) {
      const input = noise(channels * 9000, 31 + channels);
      const whole = new BiquadCascade(sos, channels).process(input).slice();
      expect(runSplit(new BiquadCascade(sos, channels), input, randomSplit(9000, 700, 4), channels)).toEqual(whole);
    }
  });

  it('complex FIR filters I and Q independently with the same taps', () => {
    const re = noise(3000, 41);
    const im = noise(3000, 42);
    const iq = new Float32Array(6000);
    re.forEach((v, i) => {
      iq[2 * i] = v;
      iq[2 * i + 1] = im[i];
    });
    const y = new FirFilter(taps, 2).process(iq);
    const yr = new FirFilter(taps, 1).process(re).slice();
    const yi = new FirFilter(taps, 1).process(im).slice();
    for (let i = 0; i < 3000; i++) {
      expect(y[2 * i]).toBe(yr[i]);
      expect(y[2 * i + 1]).toBe(yi[i]);
    }
  });

  it('rejects bad taps, factors and partial complex samples', () => {
    expect(() => new FirDecimator([], 2, 1)).toThrow(/taps: at least one/);
    expect(() => new FirDecimator([1, NaN], 2, 1)).toThrow(/taps\[1\]: must be a finite number/);
    expect(() => new FirDecimator([1], 0, 1)).toThrow(/factor: must be an integer >= 1/);
    expect(() => new FirFilter([1], 2).process(new Float32Array(3))).toThrow(/not a whole number of complex samples/);
    expect(() => new BiquadCascade([[1, 0, 0, 0, 0, 0]], 1)).toThrow(/sos\[0\]: a0 must not be 0/);
  });
});
