import { describe, expect, test } from 'vitest';
import { createSynthesizer, synthesize } from '@/dsp/synth';
import { channel, db10, db20, dftAt, meanSquare, peakIn, welch } from './synth-helpers';

const FS = 1_000_000;
/** 2^16 samples: a frequency k * FS / 2^16 lies on a DFT bin of the whole record. */
const N = 65_536;
const BIN = FS / N;

describe('tones land at the requested frequency and level', () => {
  test('a -6 dBFS complex tone reads -6 dBFS at its frequency', () => {
    const f = 1_800 * BIN; // 27.47 kHz, on a bin
    const x = synthesize({ sampleRate: FS, duration: N / FS, tones: [{ frequency: f, level: -6 }], noise: { mode: 'total', level: -60 } });
    expect(x.length).toBe(2 * N);
    // Definition of dBFS for a complex tone: 20 log10 of its amplitude, full scale 1.0 (common practice).
    const d = dftAt(x, 'complex', FS, f);
    expect(Math.abs(db20(Math.hypot(d.re, d.im)) - -6)).toBeLessThan(0.1);
    // Welch "spectrum" scaling: a complex tone of amplitude A peaks at A^2 (two-sided; scipy.signal.welch
    // documentation, SciPy 1.17). The flat-top window's scalloping is about 0.01 dB (D'Antona and Ferrero 2006, p. 70).
    const spectrum = welch(x, 'complex', FS, 8192, 'flattop', 'spectrum');
    const peak = peakIn(spectrum, -FS / 2, FS / 2);
    expect(Math.abs(db10(peak.power) - -6)).toBeLessThan(0.1);
    expect(Math.abs(peak.frequency - f)).toBeLessThanOrEqual(FS / 8192);
  });

  test('a negative-frequency complex tone lands below 0 Hz, nothing at its mirror', () => {
    const f = -5_000 * BIN;
    const x = synthesize({ sampleRate: FS, duration: N / FS, tones: [{ frequency: f, level: -20 }], noise: { mode: 'off' } });
    // A complex exponential has a single spectral line (common practice).
    expect(Math.abs(db20(Math.hypot(dftAt(x, 'complex', FS, f).re, dftAt(x, 'complex', FS, f).im)) - -20)).toBeLessThan(0.01);
    const mirror = dftAt(x, 'complex', FS, -f);
    expect(db20(Math.hypot(mirror.re, mirror.im))).toBeLessThan(-120);
  });

  test('a real tone of level L has peak amplitude 10^(L/20) (full-scale sine = 0 dBFS)', () => {
    const f = 3_000 * BIN;
    const x = synthesize({ sampleRate: FS, duration: N / FS, datatype: 'rf32_le', layout: 'real', tones: [{ frequency: f, level: -6 }], noise: { mode: 'off' } });
    expect(x.length).toBe(N);
    // A real sine A cos(wt) has DFT magnitude A/2 at +f per sample (common practice), so A = 2|X|/N.
    const d = dftAt(x, 'real', FS, f);
    expect(Math.abs(db20(2 * Math.hypot(d.re, d.im)) - -6)).toBeLessThan(0.1);
    // One-sided Welch "spectrum": a sine of amplitude A peaks at A^2/2 (scipy.signal.welch documentation,
    // SciPy 1.17; CHECKS.md), i.e. 3.01 dB below the tone's dBFS level.
    const spectrum = welch(x, 'real', FS, 8192, 'flattop', 'spectrum');
    const peak = peakIn(spectrum, 0, FS / 2);
    expect(Math.abs(db10(peak.power) - (-6 - db10(2)))).toBeLessThan(0.1);
  });

  test('the start phase sets the first sample: A e^{j phase}', () => {
    const x = synthesize({ sampleRate: FS, duration: 0.001, tones: [{ frequency: 10_000, level: 0, phase: 30 }], noise: { mode: 'off' } });
    // Definition of a tone's phase (common practice).
    expect(x[0]).toBeCloseTo(Math.cos(Math.PI / 6), 6);
    expect(x[1]).toBeCloseTo(Math.sin(Math.PI / 6), 6);
  });

  test('a frequency offset moves every tone by that many Hz', () => {
    const f = 1_000 * BIN;
    const offset = 200 * BIN;
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      tones: [{ frequency: f, level: -10 }],
      noise: { mode: 'off' },
      impairments: { frequencyOffset: offset },
    });
    const moved = dftAt(x, 'complex', FS, f + offset);
    const original = dftAt(x, 'complex', FS, f);
    // An LO error shifts the whole received spectrum (common practice).
    expect(Math.abs(db20(Math.hypot(moved.re, moved.im)) - -10)).toBeLessThan(0.01);
    expect(db20(Math.hypot(original.re, original.im))).toBeLessThan(-100);
  });

  test('tones stay exact far into a long capture (no oscillator drift)', () => {
    const fs = 10e6;
    const f = 1_234_567.891;
    const synth = createSynthesizer({ sampleRate: fs, duration: 0.5, tones: [{ frequency: f, level: 0, phase: 0 }], noise: { mode: 'off' } });
    let start = 0;
    let worst = 0;
    for (let block = synth.next(1 << 20); block; block = synth.next(1 << 20)) {
      // Check the last 64 samples of each block against the defining formula e^{j 2 pi f n / fs}.
      const count = block.length / 2;
      for (let k = count - 64; k < count; k++) {
        const n = start + k;
        const cycles = (f * n) / fs;
        const phase = 2 * Math.PI * (cycles - Math.floor(cycles));
        worst = Math.max(worst, Math.abs(block[2 * k] - Math.cos(phase)), Math.abs(block[2 * k + 1] - Math.sin(phase)));
      }
      start += count;
    }
    expect(start).toBe(5_000_000);
    // float32 resolution near 1.0 is 6e-8; allow a few of its steps (common practice).
    expect(worst).toBeLessThan(5e-7);
  });
});

describe('noise power as requested', () => {
  const samples = 1 << 20;

  test('total noise level: complex noise of -30 dBFS has mean |n|^2 = 10^(-3), half in I, half in Q', () => {
    const x = synthesize({ sampleRate: FS, duration: samples / FS, tones: [], noise: { mode: 'total', level: -30 } });
    const i = channel(x, 0);
    const q = channel(x, 1);
    // Total power of complex noise = variance of I + variance of Q (common practice); 2^20 samples give
    // a statistical error near 0.006 dB.
    expect(Math.abs(db10(meanSquare(i) + meanSquare(q)) - -30)).toBeLessThan(0.2);
    expect(Math.abs(db10(meanSquare(i) / meanSquare(q)))).toBeLessThan(0.05);
    // Welch density of complex white noise of total variance s^2 is s^2 / fs (scipy.signal.welch
    // documentation, SciPy 1.17): flat at -30 dBFS - 60 dB = -90 dBFS/Hz.
    const psd = welch(x, 'complex', FS, 1024, 'hann', 'density');
    let sum = 0;
    for (const p of psd.power) sum += p;
    expect(Math.abs(db10(sum / psd.power.length) - -90)).toBeLessThan(0.2);
  });

  test('real noise uses the same scale: per-sample variance 10^(L/10) / 2', () => {
    const x = synthesize({ sampleRate: FS, duration: samples / FS, datatype: 'rf32_le', layout: 'real', tones: [], noise: { mode: 'total', level: -20 } });
    // A full-scale sine has power 1/2; noise at L dBFS relative to it has variance 10^(L/10) / 2 (common practice).
    expect(Math.abs(db10(2 * meanSquare(x)) - -20)).toBeLessThan(0.2);
  });

  test('SNR mode sets the noise that far below the strongest component', () => {
    const spec = {
      sampleRate: FS,
      duration: samples / FS,
      tones: [
        { frequency: 100_000, level: -10 },
        { frequency: -200_000, level: -30 },
      ],
      noise: { mode: 'snr', snr: 35 } as const,
    };
    const noisy = synthesize(spec);
    const clean = synthesize({ ...spec, noise: { mode: 'off' } });
    // The components do not depend on the noise, so the difference is the noise alone.
    const diff = new Float64Array(noisy.length);
    for (let k = 0; k < diff.length; k++) diff[k] = noisy[k] - clean[k];
    // SNR = carrier power / noise power in the sampled band (common practice).
    expect(Math.abs(-10 - db10(2 * meanSquare(diff)) - 35)).toBeLessThan(0.2);
  });

  test('noise is Gaussian: zero mean, kurtosis 3', () => {
    const x = synthesize({ sampleRate: FS, duration: samples / FS, tones: [], noise: { mode: 'total', level: -20 } });
    let m1 = 0;
    let m2 = 0;
    let m4 = 0;
    for (const v of x) {
      m1 += v;
      m2 += v * v;
      m4 += v * v * v * v;
    }
    m1 /= x.length;
    m2 /= x.length;
    m4 /= x.length;
    // Normal distribution: mean 0, fourth moment 3 sigma^4 (common practice); standard error of the
    // kurtosis over 2^21 values is about 0.0034.
    expect(Math.abs(m1) / Math.sqrt(m2)).toBeLessThan(0.005);
    expect(Math.abs(m4 / (m2 * m2) - 3)).toBeLessThan(0.03);
  });
});
