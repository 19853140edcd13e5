import { describe, expect, test } from 'vitest';
import type { StreamFormat } from '@/dsp/types';
import { gaussian, seededRandom } from './spectral-fixtures';
import { measure, valueOf } from './measure-helpers';

const fs = 1e6;
const real: StreamFormat = { sampleRate: fs, sampleType: 'real' };
const complex: StreamFormat = { sampleRate: fs, sampleType: 'complex' };

describe('noise floor and noise spectral density', () => {
  const n = 1 << 18;

  test('complex white noise beside a tone: density s^2/fs, the tone left out', () => {
    // scipy.signal.welch documentation (SciPy 1.17): complex white noise of variance s^2 has a
    // (two-sided) density of s^2/fs.
    const normal = gaussian(seededRandom(21));
    const s = 0.01;
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      const w = 2 * Math.PI * 0.1234 * k;
      x[2 * k] = 0.5 * Math.cos(w) + (s / Math.SQRT2) * normal() + 0.02;
      x[2 * k + 1] = 0.5 * Math.sin(w) + (s / Math.SQRT2) * normal();
    }
    const r = measure(x, complex, { measurements: ['noise-floor'], fftSize: 4096 });
    expect(Math.abs(valueOf(r['Noise spectral density']) - 10 * Math.log10((s * s) / fs))).toBeLessThan(0.05);
    expect(r['Noise spectral density'].unit).toBe('dBFS/Hz');
    // Noise in one bin of the 'spectrum' scaling: density x ENBW x fs / fftSize (scipy.signal.welch
    // scaling; Blackman-Harris ENBW 2.00 bins, Harris 1978, Table 1).
    expect(Math.abs(valueOf(r['Noise floor (per bin)']) - 10 * Math.log10(((s * s) / fs) * 2.0 * (fs / 4096)))).toBeLessThan(0.2);
  });

  test('real white noise: one-sided density 2 s^2/fs', () => {
    // scipy.signal.welch documentation (SciPy 1.17): a one-sided density doubles every bin but DC and Nyquist.
    const normal = gaussian(seededRandom(22));
    const s = 0.05;
    const x = new Float32Array(n).map(() => s * normal());
    const r = measure(x, real, { measurements: ['noise-floor'], fftSize: 2048 });
    expect(Math.abs(valueOf(r['Noise spectral density']) - 10 * Math.log10((2 * s * s) / fs))).toBeLessThan(0.05);
  });

  test('when the window leakage of a strong tone fills the noise bins, the floor is not given', () => {
    // Hann side lobes fall from -31 dB (Harris 1978, Table 1): a full-scale tone between bins
    // leaks far above a 16-bit noise floor (Kester MT-001: 98 dB below the tone in total).
    const x = new Float32Array(1 << 16).map((_, k) => Math.round(32767 * Math.sin(2 * Math.PI * (300.5 / 4096) * k)) / 32768);
    const r = measure(x, real, { measurements: ['noise-floor'], fftSize: 4096, window: 'hann' });
    expect(r['Noise spectral density'].value).toBeNull();
    expect(r['Noise spectral density'].flags).toContain('window-limited');
  });
});

describe('SNR within a band', () => {
  test('tone over the noise of the band only: a^2 / (s^2 B / fs)', () => {
    // Complex tone power a^2, complex white noise density s^2/fs (scipy.signal.welch docs, SciPy 1.17).
    const n = 1 << 18;
    const normal = gaussian(seededRandom(23));
    const a = 0.3;
    const s = 0.02;
    const f = 150_123;
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      const w = (2 * Math.PI * f * k) / fs;
      x[2 * k] = a * Math.cos(w) + (s / Math.SQRT2) * normal();
      x[2 * k + 1] = a * Math.sin(w) + (s / Math.SQRT2) * normal();
    }
    const band = 100e3;
    const r = measure(x, complex, { measurements: ['band-snr'], fftSize: 4096, bandLow: 100e3, bandHigh: 100e3 + band });
    expect(Math.abs(valueOf(r['SNR in band']) - 10 * Math.log10((a * a) / ((s * s * band) / fs)))).toBeLessThan(0.1);
    const outside = measure(x, complex, { measurements: ['band-snr'], fftSize: 4096, bandLow: -300e3, bandHigh: -200e3 });
    expect(outside['SNR in band'].value).toBeNull();
    expect(outside['SNR in band'].reason).toMatch(/outside the band/);
  });
});

describe('two-tone IMD and third-order intercept', () => {
  test('a cubic nonlinearity y = x - k x^3 reads the intercept the textbook formula gives', () => {
    // Razavi, RF Microelectronics, 2nd ed., 2012, ch. 2: for two tones of amplitude A through
    // y = x - k x^3, each fundamental comes out at A - (9/4) k A^3 and each third-order product
    // (2 f1 - f2, 2 f2 - f1) at (3/4) k A^3; OIP3 = P + (P - P3) / 2 (CHECKS.md).
    const n = 1 << 17;
    const [f1, f2] = [100_300, 110_700];
    const a = 0.3;
    const kk = 0.1;
    const x = new Float32Array(n);
    for (let i = 0; i < n; i++) {
      const v = a * Math.cos((2 * Math.PI * f1 * i) / fs) + a * Math.cos((2 * Math.PI * f2 * i) / fs);
      x[i] = v - kk * v ** 3;
    }
    const fundamental = a - (9 / 4) * kk * a ** 3;
    const product = (3 / 4) * kk * a ** 3;
    // A real sine of amplitude A has power A^2 / 2 (0 dBFS = power 1).
    const p = 10 * Math.log10(fundamental ** 2 / 2);
    const p3 = 10 * Math.log10(product ** 2 / 2);
    const r = measure(x, real, { measurements: ['imd'], fftSize: 8192, imdGainDb: 12 });
    expect(Math.abs(valueOf(r['Two-tone level']) - p)).toBeLessThan(0.01);
    expect(Math.abs(valueOf(r['IMD3']) - (p3 - p))).toBeLessThan(0.02);
    expect(Math.abs(valueOf(r['OIP3']) - (p + (p - p3) / 2))).toBeLessThan(0.02);
    expect(Math.abs(valueOf(r['IIP3']) - (p + (p - p3) / 2 - 12))).toBeLessThan(0.02);
    const noGain = measure(x, real, { measurements: ['imd'], fftSize: 8192 });
    expect(noGain['IIP3'].value).toBeNull();
    expect(noGain['IIP3'].reason).toMatch(/imdGainDb/);
  });
});

describe('ACLR', () => {
  test('channel over its neighbours, each integrated over the same width', () => {
    // 3GPP TS 36.141 / 38.141 definition: ACLR = channel power / adjacent channel power.
    // Periodic flat bands (equal DFT magnitudes, random phases): the channel -100..100 kHz at
    // power 1, the upper neighbour 100..300 kHz 40 dB down, the lower -300..-100 kHz 50 dB down.
    const size = 2048;
    const step = fs / size;
    const random = seededRandom(31);
    const bins: { k: number; amp: number; ph: number }[] = [];
    for (let k = 0; k < size; k++) {
      const f = k < size / 2 ? k * step : (k - size) * step;
      const amp = f >= -100e3 && f < 100e3 ? 1 : f >= 100e3 && f < 300e3 ? 1e-2 : f >= -300e3 && f < -100e3 ? 10 ** (-50 / 20) : 0;
      if (amp > 0) bins.push({ k, amp, ph: 2 * Math.PI * random() });
    }
    const x = new Float32Array(2 * size);
    for (let t = 0; t < size; t++) {
      for (const { k, amp, ph } of bins) {
        x[2 * t] += (amp * Math.cos((2 * Math.PI * k * t) / size + ph)) / 100;
        x[2 * t + 1] += (amp * Math.sin((2 * Math.PI * k * t) / size + ph)) / 100;
      }
    }
    // Band edges half a bin inside, so each channel holds exactly its own bins.
    const r = measure(x, complex, { measurements: ['aclr'], fftSize: size, window: 'rectangular', bandLow: -100e3, bandHigh: 100e3 - step / 2, aclrSpacing: 200e3 });
    expect(valueOf(r['ACLR upper'])).toBeCloseTo(40, 2);
    expect(valueOf(r['ACLR lower'])).toBeCloseTo(50, 2);
    const beyond = measure(x, complex, { measurements: ['aclr'], fftSize: size, window: 'rectangular', bandLow: 300e3, bandHigh: 450e3 });
    expect(beyond['ACLR upper'].value).toBeNull();
    expect(beyond['ACLR upper'].reason).toMatch(/beyond the spectrum/);
  });
});

describe('EVM and MER', () => {
  /** Root-raised-cosine pulse at t symbol periods (closed form, e.g. Proakis, Digital Communications; roll-off b). */
  function rrc(t: number, b: number): number {
    if (t === 0) return 1 - b + (4 * b) / Math.PI;
    if (Math.abs(Math.abs(t) - 1 / (4 * b)) < 1e-9) {
      return (b / Math.SQRT2) * ((1 + 2 / Math.PI) * Math.sin(Math.PI / (4 * b)) + (1 - 2 / Math.PI) * Math.cos(Math.PI / (4 * b)));
    }
    return (Math.sin(Math.PI * t * (1 - b)) + 4 * b * t * Math.cos(Math.PI * t * (1 + b))) / (Math.PI * t * (1 - (4 * b * t) ** 2));
  }

  /** A shaped carrier of unit symbol energy after a unit-energy matched filter, plus complex noise of variance s2. */
  function carrier(points: number[][], symbols: number, sps: number, s2: number, offsetCyclesPerSample: number, seed: number): Float32Array {
    const random = seededRandom(seed);
    const normal = gaussian(seededRandom(seed + 1));
    const b = 0.35;
    const half = 8 * sps;
    const pulse = Array.from({ length: 2 * half + 1 }, (_, m) => rrc((m - half) / sps, b));
    const norm = Math.sqrt(pulse.reduce((s, v) => s + v * v, 0));
    const n = symbols * sps;
    const re = new Float64Array(n);
    const im = new Float64Array(n);
    for (let k = 0; k < symbols; k++) {
      const [pr, pi] = points[Math.floor(random() * points.length)];
      for (let m = -half; m <= half; m++) {
        const i = k * sps + m;
        if (i < 0 || i >= n) continue;
        re[i] += (pr * pulse[m + half]) / norm;
        im[i] += (pi * pulse[m + half]) / norm;
      }
    }
    const x = new Float32Array(2 * n);
    for (let i = 0; i < n; i++) {
      const a = 2 * Math.PI * offsetCyclesPerSample * i + 0.7;
      x[2 * i] = re[i] * Math.cos(a) - im[i] * Math.sin(a) + Math.sqrt(s2 / 2) * normal();
      x[2 * i + 1] = re[i] * Math.sin(a) + im[i] * Math.cos(a) + Math.sqrt(s2 / 2) * normal();
    }
    return x;
  }

  const qpsk = [[1, 1], [1, -1], [-1, 1], [-1, -1]].map(([i, q]) => [i / Math.SQRT2, q / Math.SQRT2]);
  const qam16: number[][] = [];
  for (const i of [-3, -1, 1, 3]) for (const q of [-3, -1, 1, 3]) qam16.push([i / Math.sqrt(10), q / Math.sqrt(10)]);

  test.each([
    ['qpsk', 20, qpsk],
    ['qpsk', 30, qpsk],
    ['qam16', 30, qam16],
  ] as const)('%s at Es/N0 %i dB reads EVM 1/sqrt(Es/N0)', (modulation, esn0, points) => {
    // 3GPP TS 36.104 / 38.104 (EVM definition); with additive white noise only EVM_rms ~
    // 1 / sqrt(Es/N0): 20 dB gives 10 % (common practice, CHECKS.md).
    const sps = 8;
    const s2 = 10 ** (-esn0 / 10);
    const x = carrier(points as number[][], 8192, sps, s2, 300 / 1e6, 41 + esn0);
    const r = measure(x, complex, { measurements: ['evm'], symbolRate: fs / sps, modulation, rollOff: 0.35 });
    const expected = 100 / Math.sqrt(10 ** (esn0 / 10));
    expect(Math.abs(valueOf(r['EVM']) - expected) / expected).toBeLessThan(0.04);
    expect(Math.abs(valueOf(r['MER']) - esn0)).toBeLessThan(0.35);
    expect(valueOf(r['EVM (dB)'])).toBeCloseTo(20 * Math.log10(valueOf(r['EVM']) / 100), 9);
    expect(Math.abs(valueOf(r['Carrier offset']) - 300)).toBeLessThan(5);
  });

  test('evm needs a symbol rate and a complex stream', () => {
    expect(() => measure(new Float32Array(16), complex, { measurements: ['evm'] })).toThrow(/symbolRate/);
    const r = measure(new Float32Array(4096).fill(0.1), real, { measurements: ['evm'], symbolRate: 1e5 });
    expect(r['EVM'].value).toBeNull();
    expect(r['EVM'].reason).toMatch(/complex/);
  });
});
