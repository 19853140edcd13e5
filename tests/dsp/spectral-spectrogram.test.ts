import { describe, expect, test } from 'vitest';
import { SpectrogramAccumulator } from '@/dsp/spectral';
import { loadSpectralFixture, maxAbsDiff, randomBlocks } from './spectral-fixtures';

interface SpectrogramCase {
  input: 'real' | 'complex';
  scaling: 'density' | 'spectrum';
  overlap: number;
  fftSize: number;
  frequencies: number[];
  times: number[];
  /** power[row][column], row = time. */
  power: number[][];
}
const fixture = loadSpectralFixture<{ sampleRate: number; real: number[]; complex: number[]; cases: SpectrogramCase[] }>('spectrogram.json');

function run(c: SpectrogramCase, blocks: Float32Array[], maxRows: number) {
  const acc = new SpectrogramAccumulator({
    sampleRate: fixture.sampleRate,
    sampleType: c.input,
    fftSize: c.fftSize,
    window: 'hann',
    overlap: c.overlap,
    scaling: c.scaling,
    maxRows,
  });
  for (const b of blocks) acc.push(b);
  return acc;
}

/** Largest level difference (dB) between our rows and reference power rows. */
function maxDbDiff(levels: number[][], power: number[][]): number {
  let worst = 0;
  expect(levels.length).toBe(power.length);
  for (let r = 0; r < power.length; r++) {
    for (let k = 0; k < power[r].length; k++) worst = Math.max(worst, Math.abs(levels[r][k] - 10 * Math.log10(power[r][k])));
  }
  return worst;
}

describe('spectrogram against scipy.signal.spectrogram (mode psd, detrend=False)', () => {
  test.each(fixture.cases.map((c) => [`${c.input} ${c.scaling} overlap ${c.overlap}`, c]))('%s', (_label, c) => {
    const data = Float32Array.from(c.input === 'real' ? fixture.real : fixture.complex);
    const acc = run(c, [data], 10_000);
    const r = acc.result();
    // Reference: scipy.signal.spectrogram, SciPy version in spectrogram.json: rows stamped at
    // segment centres, as ours are.
    expect(maxAbsDiff(r.times, c.times)).toBeLessThan(1e-12);
    expect(maxAbsDiff(r.frequencies, c.frequencies)).toBeLessThan(1e-9);
    expect(maxDbDiff(r.levels, c.power)).toBeLessThan(1e-6);

    // Block-size invariance.
    const split = run(c, randomBlocks(data, c.input === 'complex' ? 2 : 1, 11), 10_000).result();
    expect(split.levels).toEqual(r.levels);

    // Bounded image: with maxRows 8, rows average 2^k consecutive SciPy rows (power mean).
    const bounded = run(c, randomBlocks(data, c.input === 'complex' ? 2 : 1, 5), 8);
    const b = bounded.result();
    expect(b.levels.length).toBeLessThanOrEqual(8);
    const per = bounded.rowSegments;
    const expected: number[][] = [];
    for (let start = 0; start < c.power.length; start += per) {
      const rows = c.power.slice(start, start + per);
      expected.push(rows[0].map((_, k) => rows.reduce((s, row) => s + row[k], 0) / rows.length));
    }
    expect(maxDbDiff(b.levels, expected)).toBeLessThan(1e-6);
    expect(b.times[1] - b.times[0]).toBeCloseTo((per * c.fftSize * (1 - c.overlap)) / fixture.sampleRate, 12);
  });
});

describe('spectrogram size bound', () => {
  test('a long stream keeps at most maxRows rows and fftSize columns', () => {
    const acc = new SpectrogramAccumulator({ sampleRate: 1e6, sampleType: 'complex', fftSize: 64, overlap: 0.5, maxRows: 37 });
    const block = new Float32Array(2 * 10_000).map((_, k) => Math.sin(k * 0.01));
    let maxSeen = 0;
    for (let i = 0; i < 200; i++) {
      acc.push(block);
      if (i % 20 === 0) maxSeen = Math.max(maxSeen, acc.result().levels.length);
    }
    const r = acc.result();
    expect(maxSeen).toBeLessThanOrEqual(37);
    expect(r.levels.length).toBeLessThanOrEqual(37);
    expect(r.levels.length).toBeGreaterThan(37 / 2 - 1);
    expect(r.levels[0].length).toBe(64);
    expect(r.times.length).toBe(r.levels.length);
    // Rows cover the stream: 2 million samples, 62 499 segments of hop 32.
    expect(acc.segments).toBe(Math.floor((2_000_000 - 64) / 32) + 1);
    expect(r.times.at(-1)!).toBeLessThan(2);
    expect(r.times.at(-1)!).toBeGreaterThan(2 - (2 * acc.rowSegments * 32) / 1e6);
  });

  test('bad maxRows names the field', () => {
    expect(() => new SpectrogramAccumulator({ sampleRate: 1, sampleType: 'real', fftSize: 16, maxRows: 1 })).toThrow(/maxRows: must be an integer >= 2/);
  });
});
