import { describe, expect, test } from 'vitest';
import { constellation, PulseTable, rootRaisedCosine, synthesize, type DigitalModulation } from '@/dsp/synth';
import { db10, db20, dftAt, meanSquare, welch } from './synth-helpers';

/**
 * Root-raised-cosine pulse by numerical inverse Fourier transform of the square root of the
 * raised-cosine spectrum (T = 1): H(f) = 1 for |f| <= (1 - b)/2,
 * (1/2)[1 + cos(pi/b (|f| - (1 - b)/2))] up to (1 + b)/2, 0 beyond (J. G. Proakis and M. Salehi,
 * "Digital Communications", 5th ed., 2008, raised-cosine spectrum; from memory for the layout).
 * Independent of the closed form the synthesizer uses.
 */
function rrcByIntegration(t: number, b: number): number {
  const edge = (1 + b) / 2;
  const steps = 4000;
  const h = edge / steps;
  let sum = 0;
  for (let k = 0; k <= steps; k++) {
    const f = k * h;
    const flat = (1 - b) / 2;
    const spectrum = f <= flat ? 1 : 0.5 * (1 + Math.cos((Math.PI / b) * (f - flat)));
    const weight = k === 0 || k === steps ? 1 : k % 2 === 1 ? 4 : 2; // Simpson's rule
    sum += weight * Math.sqrt(Math.max(spectrum, 0)) * Math.cos(2 * Math.PI * f * t);
  }
  return 2 * (h / 3) * sum;
}

describe('root-raised-cosine pulse', () => {
  test.each([0.2, 0.35, 0.5, 1])('closed form matches the inverse transform of sqrt(raised cosine), roll-off %f', (b) => {
    for (const t of [0, 0.1, 0.25, 1 / (4 * b), 0.5, 0.8, 1, 1.5, 2.3, 3.7]) {
      expect(Math.abs(rootRaisedCosine(t, b) - rrcByIntegration(t, b))).toBeLessThan(1e-5);
      expect(rootRaisedCosine(-t, b)).toBe(rootRaisedCosine(t, b));
    }
  });

  test('the untruncated pulse has unit energy; the table restores the energy truncation removes', () => {
    // Parseval: the energy is the integral of the raised-cosine spectrum, which is 1 for T = 1 (Proakis and Salehi 2008).
    let energy = 0;
    for (let k = -40_000; k <= 40_000; k++) energy += rootRaisedCosine(k / 1000, 0.35) ** 2 / 1000;
    expect(Math.abs(energy - 1)).toBeLessThan(1e-3);
    const table = new PulseTable(0.35, 8);
    let tableEnergy = 0;
    for (let k = -4000; k <= 4000; k++) tableEnergy += table.valueAt(k / 1000) ** 2 / 1000;
    expect(Math.abs(tableEnergy - 1)).toBeLessThan(1e-3);
  });
});

/** Matched-filter a carrier that sits at `carrier` Hz, sample at the symbol instants, return the complex decision values. */
function matchedSymbols(x: Float32Array, fs: number, symbolRate: number, carrier: number, rollOff: number, span: number): { re: number[]; im: number[] } {
  const n = x.length / 2;
  const symbols = Math.floor((n * symbolRate) / fs);
  const re: number[] = [];
  const im: number[] = [];
  const half = span / 2;
  // Continuous matched filter evaluated at t_k = k / Rs: sum_n y[n] p((t_k - n / fs) Rs), y mixed to 0 Hz.
  for (let k = span; k < symbols - span; k++) {
    const centre = (k * fs) / symbolRate;
    const first = Math.ceil(centre - (half * fs) / symbolRate);
    const last = Math.floor(centre + (half * fs) / symbolRate);
    let sr = 0;
    let si = 0;
    for (let m = first; m <= last; m++) {
      const p = rootRaisedCosine(((k * fs) / symbolRate - m) * (symbolRate / fs), rollOff);
      const phase = (-2 * Math.PI * carrier * m) / fs;
      const c = Math.cos(phase);
      const s = Math.sin(phase);
      const yr = x[2 * m] * c - x[2 * m + 1] * s;
      const yi = x[2 * m] * s + x[2 * m + 1] * c;
      sr += p * yr;
      si += p * yi;
    }
    re.push(sr);
    im.push(si);
  }
  return { re, im };
}

/** Nearest-point decisions with a least-squares complex gain; EVM (rms, fraction) and point counts. */
function evm(values: { re: number[]; im: number[] }, modulation: DigitalModulation): { evm: number; counts: number[]; worstClusterError: number } {
  const points = constellation(modulation).points;
  const count = values.re.length;
  let power = 0;
  for (let k = 0; k < count; k++) power += values.re[k] ** 2 + values.im[k] ** 2;
  let gRe = Math.sqrt(power / count);
  let gIm = 0;
  let decisions: number[] = [];
  const nearest = (r: number, i: number): number => {
    let best = 0;
    let bestD = Infinity;
    for (let p = 0; p < points.length / 2; p++) {
      const d = (r - points[2 * p]) ** 2 + (i - points[2 * p + 1]) ** 2;
      if (d < bestD) {
        bestD = d;
        best = p;
      }
    }
    return best;
  };
  for (let pass = 0; pass < 3; pass++) {
    const g2 = gRe * gRe + gIm * gIm;
    decisions = values.re.map((r, k) => nearest((r * gRe + values.im[k] * gIm) / g2, (values.im[k] * gRe - r * gIm) / g2));
    // Least-squares gain: g = sum z conj(d) / sum |d|^2.
    let nr = 0;
    let ni = 0;
    let dd = 0;
    decisions.forEach((p, k) => {
      const dr = points[2 * p];
      const di = points[2 * p + 1];
      nr += values.re[k] * dr + values.im[k] * di;
      ni += values.im[k] * dr - values.re[k] * di;
      dd += dr * dr + di * di;
    });
    gRe = nr / dd;
    gIm = ni / dd;
  }
  const g2 = gRe * gRe + gIm * gIm;
  let error = 0;
  const counts = new Array<number>(points.length / 2).fill(0);
  const sums = counts.map(() => ({ re: 0, im: 0 }));
  decisions.forEach((p, k) => {
    const r = (values.re[k] * gRe + values.im[k] * gIm) / g2;
    const i = (values.im[k] * gRe - values.re[k] * gIm) / g2;
    error += (r - points[2 * p]) ** 2 + (i - points[2 * p + 1]) ** 2;
    counts[p]++;
    sums[p].re += r;
    sums[p].im += i;
  });
  let worstClusterError = 0;
  sums.forEach((s, p) => {
    if (counts[p] > 0) worstClusterError = Math.max(worstClusterError, Math.hypot(s.re / counts[p] - points[2 * p], s.im / counts[p] - points[2 * p + 1]));
  });
  return { evm: Math.sqrt(error / count), counts, worstClusterError };
}

describe('digital carriers after a matched root-raised-cosine filter', () => {
  const cases: [DigitalModulation, number, number][] = [
    // modulation, sample rate, symbol rate (8 samples per symbol, then a non-integer 7.69)
    ['qpsk', 1e6, 125e3],
    ['qpsk', 1e6, 130e3],
    ['bpsk', 1e6, 125e3],
    ['qam16', 1e6, 125e3],
  ];
  test.each(cases)('%s at %f Sps, %f sym/s: symbols cluster on the constellation (small EVM)', (modulation, fs, symbolRate) => {
    const carrier = 150_000;
    const x = synthesize({
      sampleRate: fs,
      duration: 0.02,
      tones: [],
      carriers: [{ modulation, frequency: carrier, level: -10, symbolRate, rollOff: 0.35, span: 16 }],
      noise: { mode: 'off' },
      seed: 5,
    });
    const symbols = matchedSymbols(x, fs, symbolRate, carrier, 0.35, 16);
    const result = evm(symbols, modulation);
    // A root-raised-cosine pair is a raised-cosine overall response, which has no intersymbol
    // interference at the symbol instants (Nyquist criterion; Proakis and Salehi 2008). What is left
    // is truncation of the pulse to 16 symbols and the table interpolation.
    expect(result.evm).toBeLessThan(0.01);
    expect(result.worstClusterError).toBeLessThan(0.01);
    // Random symbols visit every point about equally often.
    const expected = symbols.re.length / result.counts.length;
    for (const c of result.counts) expect(Math.abs(c - expected)).toBeLessThan(0.35 * expected);
  });

  test.each(['bpsk', 'qpsk', 'qam16'] as DigitalModulation[])('%s carrier mean power equals its level', (modulation) => {
    const x = synthesize({
      sampleRate: 1e6,
      duration: 0.2,
      tones: [],
      carriers: [{ modulation, frequency: -100_000, level: -13, symbolRate: 100e3, rollOff: 0.25 }],
      noise: { mode: 'off' },
    });
    // Level = mean power of the complex envelope (definition, spec.ts); over 20 000 random symbols the
    // estimate scatters by a few hundredths of a dB.
    expect(Math.abs(db10(2 * meanSquare(x)) - -13)).toBeLessThan(0.2);
  });

  test('the shaped spectrum is the raised cosine: half power at +-Rs/2, nothing beyond (1 + b) Rs / 2', () => {
    const fs = 1e6;
    const symbolRate = 130e3; // non-integer samples per symbol
    const carrier = 100_000;
    const x = synthesize({
      sampleRate: fs,
      duration: 0.5,
      tones: [],
      carriers: [{ modulation: 'qpsk', frequency: carrier, level: -10, symbolRate, rollOff: 0.35, span: 16 }],
      noise: { mode: 'off' },
    });
    const psd = welch(x, 'complex', fs, 4096, 'blackman-harris', 'density');
    const nearestBin = (f: number) => {
      let best = 0;
      for (let k = 1; k < psd.frequencies.length; k++) if (Math.abs(psd.frequencies[k] - f) < Math.abs(psd.frequencies[best] - f)) best = k;
      return best;
    };
    const at = (f: number) => psd.power[nearestBin(f)];
    /** Mean density over the bins within +-halfWidth Hz of f (averages out the estimate's scatter). */
    const around = (f: number, halfWidth: number) => {
      const lo = nearestBin(f - halfWidth);
      const hi = nearestBin(f + halfWidth);
      let sum = 0;
      for (let k = lo; k <= hi; k++) sum += psd.power[k];
      return sum / (hi - lo + 1);
    };
    const top = around(carrier, 0.25 * symbolRate);
    // Raised-cosine spectrum is exactly 1/2 at |f| = 1/(2T) and antisymmetric about it, so its mean over
    // a symmetric interval there is 1/2 too (Proakis and Salehi 2008): -3.01 dB.
    expect(Math.abs(db10(around(carrier + symbolRate / 2, 3_000) / top) - -3.01)).toBeLessThan(0.3);
    expect(Math.abs(db10(around(carrier - symbolRate / 2, 3_000) / top) - -3.01)).toBeLessThan(0.3);
    // Beyond the band edge only the truncation and window leakage remain.
    expect(db10(at(carrier + 0.8 * symbolRate) / top)).toBeLessThan(-40);
    expect(db10(at(carrier - 0.8 * symbolRate) / top)).toBeLessThan(-40);
  });
});

describe('analog carriers', () => {
  const FS = 1e6;
  const N = 65_536;
  const BIN = FS / N;
  const level = (x: Float32Array, f: number) => {
    const d = dftAt(x, 'complex', FS, f);
    return db20(Math.hypot(d.re, d.im));
  };

  test('AM by a tone: carrier at its level, sidebands 20 log10(depth / 2) below it', () => {
    const fc = 1_600 * BIN;
    const fm = 64 * BIN;
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      tones: [],
      carriers: [{ modulation: 'am', frequency: fc, level: -10, depth: 0.5, toneFrequency: fm }],
      noise: { mode: 'off' },
    });
    // A(1 + m cos wm t) e^{j wc t} = A e^{j wc t} + (mA/2) e^{j(wc +- wm)t} (common practice).
    expect(Math.abs(level(x, fc) - -10)).toBeLessThan(0.01);
    expect(Math.abs(level(x, fc + fm) - (-10 + db20(0.25)))).toBeLessThan(0.01);
    expect(Math.abs(level(x, fc - fm) - (-10 + db20(0.25)))).toBeLessThan(0.01);
  });

  test('FM by a tone: carrier and sidebands follow the Bessel functions J0 and J1', () => {
    const fc = -1_600 * BIN;
    const fm = 64 * BIN;
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      tones: [],
      carriers: [{ modulation: 'fm', frequency: fc, level: -6, deviation: fm, toneFrequency: fm }],
      noise: { mode: 'off' },
    });
    // e^{j b sin wt} = sum_n J_n(b) e^{j n w t} (Jacobi-Anger expansion); J0(1) = 0.7651976866,
    // J1(1) = 0.4400505857 (M. Abramowitz and I. Stegun, "Handbook of Mathematical Functions", 1964, Table 9.1).
    expect(Math.abs(level(x, fc) - (-6 + db20(0.7651976866)))).toBeLessThan(0.01);
    expect(Math.abs(level(x, fc + fm) - (-6 + db20(0.4400505857)))).toBeLessThan(0.01);
    expect(Math.abs(level(x, fc - fm) - (-6 + db20(0.4400505857)))).toBeLessThan(0.01);
    // Constant envelope: mean power equals the level.
    expect(Math.abs(db10(2 * meanSquare(x)) - -6)).toBeLessThan(0.01);
  });

  test('FM carrier vanishes at the first zero of J0 (index 2.404826)', () => {
    const fc = 1_600 * BIN;
    const fm = 64 * BIN;
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      tones: [],
      // First zero of J0: 2.404825558 (Abramowitz and Stegun 1964, Table 9.5).
      carriers: [{ modulation: 'fm', frequency: fc, level: 0, deviation: 2.404825558 * fm, toneFrequency: fm }],
      noise: { mode: 'off' },
    });
    expect(level(x, fc)).toBeLessThan(-70);
  });
});

describe('real IF carriers', () => {
  test('a QPSK carrier on a real 10.7 MHz IF sits there with the sine-equivalent power', () => {
    const fs = 40e6;
    const x = synthesize({
      sampleRate: fs,
      duration: 0.005,
      datatype: 'rf32_le',
      layout: 'real',
      tones: [],
      carriers: [{ modulation: 'qpsk', frequency: 10.7e6, level: -12, symbolRate: 1e6, rollOff: 0.35 }],
      noise: { mode: 'off' },
    });
    // Re{s e^{jwt}} has half the power of s (common practice), so 2 <x^2> = 10^(L/10).
    expect(Math.abs(db10(2 * meanSquare(x)) - -12)).toBeLessThan(0.2);
    const psd = welch(x, 'real', fs, 2048, 'hann', 'density');
    let peak = 0;
    for (let k = 0; k < psd.power.length; k++) if (psd.power[k] > psd.power[peak]) peak = k;
    expect(Math.abs(psd.frequencies[peak] - 10.7e6)).toBeLessThan(0.7e6);
  });
});
