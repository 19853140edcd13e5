import { describe, expect, test } from 'vitest';
import { WelchAccumulator } from '@/dsp/spectral';
import type { WindowName } from '@/dsp/windows';
import { gaussian, loadSpectralFixture, maxAbs, maxAbsDiff, randomBlocks, seededRandom } from './spectral-fixtures';

interface WelchCase {
  input: 'real' | 'complex';
  scaling: 'density' | 'spectrum';
  window: WindowName;
  overlap: number;
  fftSize: number;
  frequencies: number[];
  power: number[];
}
const fixture = loadSpectralFixture<{ sampleRate: number; real: number[]; complex: number[]; cases: WelchCase[] }>('welch.json');

function welchOf(c: WelchCase, blocks: Float32Array[]): WelchAccumulator {
  const acc = new WelchAccumulator({
    sampleRate: fixture.sampleRate,
    sampleType: c.input,
    fftSize: c.fftSize,
    window: c.window,
    overlap: c.overlap,
    scaling: c.scaling,
  });
  for (const b of blocks) acc.push(b);
  acc.finish();
  return acc;
}

describe('Welch PSD against scipy.signal.welch (detrend=False)', () => {
  test.each(fixture.cases.map((c) => [`${c.input} ${c.scaling} ${c.window} overlap ${c.overlap}`, c]))('%s', (_label, c) => {
    const data = Float32Array.from(c.input === 'real' ? fixture.real : fixture.complex);
    const acc = welchOf(c, [data]);
    // Reference: scipy.signal.welch, SciPy version in welch.json; complex cases fftshift-ed.
    expect(maxAbsDiff(acc.frequencies(), c.frequencies)).toBeLessThan(1e-9);
    expect(maxAbsDiff(acc.power(), c.power) / maxAbs(c.power)).toBeLessThan(1e-9);
    // Block-size invariance: random block splits give identical results.
    const step = c.input === 'complex' ? 2 : 1;
    const split = welchOf(c, randomBlocks(data, step, 7));
    expect(Array.from(split.power())).toEqual(Array.from(acc.power()));
    // Blocks of 0 to 2 samples: every segment straddles many blocks.
    const tiny = welchOf(c, randomBlocks(data, step, 8, 3));
    expect(Array.from(tiny.power())).toEqual(Array.from(acc.power()));
  });
});

describe('Welch scaling facts', () => {
  test('a bin-centred real sine of amplitude A peaks at A^2/2 with scaling "spectrum"', () => {
    // scipy.signal.welch documentation (SciPy 1.17), scaling="spectrum": power spectrum in V^2.
    const fs = 1000;
    const n = 1024;
    const a = 0.8;
    const bin = 64;
    const x = new Float32Array(16 * n).map((_, k) => a * Math.sin((2 * Math.PI * bin * k) / n));
    for (const window of ['hann', 'blackman-harris', 'flattop', 'rectangular'] as const) {
      const acc = new WelchAccumulator({ sampleRate: fs, sampleType: 'real', fftSize: n, window, scaling: 'spectrum' });
      acc.push(x);
      const p = acc.power();
      expect(p[bin] / ((a * a) / 2)).toBeCloseTo(1, 5);
      // The dB readout: 10 log10(A^2/2) dBFS.
      const r = acc.result();
      expect(r.peak.level).toBeCloseTo(10 * Math.log10((a * a) / 2), 4);
      expect(r.peak.frequency).toBeCloseTo((bin * fs) / n, 6);
      expect(r.unit).toBe('dBFS');
    }
  });

  test('complex white noise of variance s^2 has density s^2/fs', () => {
    // scipy.signal.welch documentation (SciPy 1.17), scaling="density": two-sided for complex input.
    const fs = 2.5e6;
    const s = 0.1;
    const normal = gaussian(seededRandom(3));
    const n = 1 << 18;
    const x = new Float32Array(2 * n);
    // Variance s^2 in total, s^2/2 in each of I and Q.
    for (let k = 0; k < x.length; k++) x[k] = (s / Math.SQRT2) * normal();
    const acc = new WelchAccumulator({ sampleRate: fs, sampleType: 'complex', fftSize: 256, window: 'hann', overlap: 0.5 });
    acc.push(x);
    const p = acc.power();
    let mean = 0;
    for (const v of p) mean += v / p.length;
    expect(mean / ((s * s) / fs)).toBeCloseTo(1, 2);
    expect(acc.result().unit).toBe('dBFS/Hz');
    expect(acc.result(-10).unit).toBe('dBm/Hz');
    expect(acc.result(-10).levels[5]).toBeCloseTo(acc.result().levels[5] - 10, 10);
  });

  test('resolution bandwidth is ENBW x fs / N', () => {
    const acc = new WelchAccumulator({ sampleRate: 1e6, sampleType: 'complex', fftSize: 4096, window: 'hann' });
    // Hann ENBW 1.5 bins (F. J. Harris, Proc. IEEE 66(1), 1978, Table 1).
    expect(acc.resolutionBandwidth).toBeCloseTo((1.5 * 1e6) / 4096, 6);
  });

  test('a complex tone lands on its signed frequency, 0 Hz centred', () => {
    const fs = 1e6;
    const n = 1024;
    const f = -187500.7;
    const x = new Float32Array(2 * 8 * n);
    for (let k = 0; k < x.length / 2; k++) {
      x[2 * k] = Math.cos((2 * Math.PI * f * k) / fs);
      x[2 * k + 1] = Math.sin((2 * Math.PI * f * k) / fs);
    }
    const acc = new WelchAccumulator({ sampleRate: fs, sampleType: 'complex', fftSize: n, window: 'blackman-harris' });
    acc.push(x);
    const r = acc.result();
    expect(r.frequencies[0]).toBe(-fs / 2);
    expect(r.frequencies[n / 2]).toBe(0);
    // Interpolation lands within a tenth of a bin.
    expect(Math.abs(r.peak.frequency - f)).toBeLessThan(0.1 * (fs / n));
  });

  test('max hold keeps the highest power per bin', () => {
    const n = 64;
    const x = new Float32Array(4 * n);
    // A burst in the third segment only (rectangular window, no overlap).
    for (let k = 2 * n; k < 3 * n; k++) x[k] = Math.cos((2 * Math.PI * 8 * k) / n);
    const mk = (averaging: 'mean' | 'max') => {
      const acc = new WelchAccumulator({ sampleRate: 64, sampleType: 'real', fftSize: n, window: 'rectangular', overlap: 0, scaling: 'spectrum', averaging });
      acc.push(x);
      return acc.power();
    };
    // A full-scale cosine: A^2/2 = 0.5 in its bin for that segment; the mean over 4 segments is a quarter of it.
    expect(mk('max')[8]).toBeCloseTo(0.5, 7);
    expect(mk('mean')[8]).toBeCloseTo(0.125, 7);
  });

  test('a stream shorter than one segment is analysed as one shorter segment', () => {
    const acc = new WelchAccumulator({ sampleRate: 100, sampleType: 'real', fftSize: 256, window: 'hann' });
    acc.push(new Float32Array(100).map((_, k) => Math.sin(k)));
    acc.finish();
    expect(acc.segments).toBe(1);
    expect(acc.result().levels).toHaveLength(129);
  });

  test('bad input names the field', () => {
    expect(() => new WelchAccumulator({ sampleRate: 0, sampleType: 'real', fftSize: 256 })).toThrow(/sampleRate: must be/);
    expect(() => new WelchAccumulator({ sampleRate: 1, sampleType: 'real', fftSize: 100 })).toThrow(/fftSize: must be a power of two/);
    expect(() => new WelchAccumulator({ sampleRate: 1, sampleType: 'real', fftSize: 256, overlap: 1 })).toThrow(/overlap: must be/);
    const acc = new WelchAccumulator({ sampleRate: 1, sampleType: 'complex', fftSize: 16 });
    expect(() => acc.push(new Float32Array(3))).toThrow(/not a whole number of complex samples/);
    expect(() => acc.power()).toThrow(/no samples/);
  });
});
