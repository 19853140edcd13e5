import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, test } from 'vitest';
import { imageRejectionDb } from '@/dsp/measure';
import type { StreamFormat } from '@/dsp/types';
import { gaussian, seededRandom } from './spectral-fixtures';
import { measure, valueOf } from './measure-helpers';

interface IdealAdcFixture {
  versions: { numpy: string; scipy: string };
  samples: number;
  phase: number;
  cases: { bits: number; placement: string; cyclesPerSample: number; sinadDb: number }[];
}
const idealAdc: IdealAdcFixture = JSON.parse(
  readFileSync(fileURLToPath(new URL('../reference/fixtures/readouts/ideal-adc.json', import.meta.url)), 'utf8'),
);

/** The ideal mid-rise N-bit quantiser of tests/reference/gen_readouts.py (full scale +/-1). */
function quantisedSine(n: number, cyclesPerSample: number, bits: number, phase: number): Float32Array {
  const q = 2 / 2 ** bits;
  const x = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    const v = Math.sin(2 * Math.PI * cyclesPerSample * k + phase);
    x[k] = (Math.max(-(2 ** (bits - 1)), Math.min(2 ** (bits - 1) - 1, Math.floor(v / q))) + 0.5) * q;
  }
  return x;
}

const real: StreamFormat = { sampleRate: 1e6, sampleType: 'real' };
const complex: StreamFormat = { sampleRate: 1e6, sampleType: 'complex' };

describe('ideal ADC: SINAD, SNR and ENOB from the sine fit (IEEE Std 1241-2010, 4.1.4)', () => {
  // W. Kester, Analog Devices MT-001: an ideal N-bit ADC with a full-scale sine reads
  // SNR = 6.02 N + 1.76 dB. The numpy least-squares SINAD of the same samples is in
  // tests/reference/fixtures/readouts/ideal-adc.json (gen_readouts.py, numpy/SciPy versions inside).
  test.each(idealAdc.cases.map((c) => [c.bits, c.placement, c.cyclesPerSample * 8192, c]))('%i bits, %s (%f cycles per 8192)', (bits, _p, _c, c) => {
    const x = quantisedSine(idealAdc.samples, c.cyclesPerSample, bits, idealAdc.phase);
    const r = measure(x, real, { measurements: ['sinad', 'snr', 'enob'], fftSize: 8192, harmonics: 1 });
    const sinad = valueOf(r['SINAD']);
    // The engine's four-parameter fit against numpy.linalg.lstsq at the true frequency.
    expect(Math.abs(sinad - c.sinadDb)).toBeLessThan(0.01);
    // Kester MT-001 within 0.1 dB at 12 and 16 bits. At 8 bits a full-scale sine's quantisation
    // error is 0.1 dB above the uniform q^2/12 the formula assumes (numpy shows the same, see the
    // fixture), so 0.12 dB there.
    expect(Math.abs(sinad - (6.02 * bits + 1.76))).toBeLessThan(bits === 8 ? 0.12 : 0.1);
    // harmonics = 1: nothing is set apart as distortion, so SNR = SINAD.
    expect(valueOf(r['SNR'])).toBeCloseTo(sinad, 6);
    // IEEE Std 1241-2010: ENOB = (SINAD - 1.76) / 6.02.
    expect(valueOf(r['ENOB'])).toBeCloseTo((sinad - 1.76) / 6.02, 9);
    expect(Math.abs(valueOf(r['ENOB']) - bits)).toBeLessThan(0.02);
    expect(r['SINAD'].definition).toBe('sinad-sine-fit');
  });

  test('the window does not bound the fit: a 16-bit tone between bins reads 98 dB with a Hann window', () => {
    // Kester MT-001: 16 bits, 98.1 dB. A Hann window's leakage (-31 dB side lobes, Harris 1978,
    // Table 1) would bound a spectral SNR far below that.
    const x = quantisedSine(1 << 16, 777.43 / 8192, 16, 1.1);
    const r = measure(x, real, { measurements: ['sinad'], fftSize: 8192, window: 'hann' });
    expect(Math.abs(valueOf(r['SINAD']) - 98.1)).toBeLessThan(0.1);
  });

  test('complex tone: SNR from the fit against the known noise variance', () => {
    // A complex tone of amplitude A has power A^2; complex white noise of variance s^2 (s^2/2 per
    // channel) has power s^2 (scipy.signal.welch documentation, SciPy 1.17: density s^2/fs).
    const n = 1 << 17;
    const normal = gaussian(seededRandom(3));
    const a = 0.5;
    const s = 0.002;
    const f = 123_456.7 / 1e6;
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      x[2 * k] = a * Math.cos(2 * Math.PI * f * k) + (s / Math.SQRT2) * normal() + 0.01;
      x[2 * k + 1] = a * Math.sin(2 * Math.PI * f * k) + (s / Math.SQRT2) * normal();
    }
    const r = measure(x, complex, { measurements: ['snr', 'sinad', 'thd'] });
    const snr = 10 * Math.log10((a * a) / (s * s));
    expect(Math.abs(valueOf(r['SNR']) - snr)).toBeLessThan(0.05);
    expect(Math.abs(valueOf(r['SINAD']) - snr)).toBeLessThan(0.05);
    expect(r['THD'].value).toBeNull();
    expect(r['THD'].reason).toMatch(/real streams only/);
  });
});

describe('THD and the harmonics table', () => {
  test('harmonics at known levels, one of them aliased, read back in dBc at their aliased frequency', () => {
    // IEEE Std 1241-2010 / Kester MT-003: THD = total harmonic power over the carrier; a real
    // harmonic above fs/2 shows at its alias (common practice).
    const fs = 1e6;
    const f = 130_017.3;
    const n = 1 << 17;
    const levels: Record<number, number> = { 2: -60, 3: -70, 4: -80 };
    const normal = gaussian(seededRandom(11));
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) {
      const w = (2 * Math.PI * f * k) / fs;
      let v = 0.5 * Math.sin(w) + 1e-5 * normal();
      for (const [h, dbc] of Object.entries(levels)) v += 0.5 * 10 ** (dbc / 20) * Math.sin(Number(h) * w + 0.4);
      x[k] = v;
    }
    const r = measure(x, real, { measurements: ['thd', 'harmonics', 'sinad', 'snr', 'enob'], harmonics: 5 });
    expect(Math.abs(valueOf(r['Harmonic 2']) - -60)).toBeLessThan(0.01);
    expect(Math.abs(valueOf(r['Harmonic 3']) - -70)).toBeLessThan(0.02);
    expect(Math.abs(valueOf(r['Harmonic 4']) - -80)).toBeLessThan(0.1);
    // 4 f = 520 069.2 Hz lies above fs/2 and folds to fs - 4 f = 479 930.8 Hz.
    expect(valueOf(r['Harmonic 4 frequency'])).toBeCloseTo(fs - 4 * f, 1);
    expect(valueOf(r['Harmonic 2 frequency'])).toBeCloseTo(2 * f, 1);
    // No 5th harmonic was put in: it reads at the noise, far below the others, or not at all.
    expect(r['Harmonic 5'].value === null || r['Harmonic 5'].value! < -100).toBe(true);
    const thd = 10 * Math.log10(10 ** -6 + 10 ** -7 + 10 ** -8);
    expect(Math.abs(valueOf(r['THD']) - thd)).toBeLessThan(0.02);
    // SINAD counts the harmonics, SNR does not: SINAD ~ -THD here, as the noise is 40 dB lower.
    expect(Math.abs(valueOf(r['SINAD']) + thd)).toBeLessThan(0.05);
    expect(valueOf(r['SNR'])).toBeGreaterThan(valueOf(r['SINAD']) + 30);
  });
});

describe('SFDR from integrated main-lobe power', () => {
  const fs = 1e6;
  const n = 1 << 17;

  test('a -60 dBc spur half a bin off its centre reads 60 dB whatever the window scallops', () => {
    // Peak bins would differ by up to the scalloping loss (Hann 1.42 dB, F. J. Harris, Proc. IEEE
    // 66(1), 1978, Table 1); main-lobe power / ENBW does not scallop (common practice).
    const fftSize = 4096;
    const bin = fs / fftSize;
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) {
      x[k] = 0.5 * Math.cos((2 * Math.PI * 200 * bin * k) / fs) + 0.5e-3 * Math.cos((2 * Math.PI * 611.5 * bin * k) / fs) + 1e-6 * Math.sin(k);
    }
    for (const window of ['hann', 'blackman-harris'] as const) {
      const r = measure(x, real, { measurements: ['sfdr'], fftSize, window });
      expect(Math.abs(valueOf(r['SFDR']) - 60)).toBeLessThan(0.05);
      // dBFS against a full-scale real sine (power 0.5): spur power (0.5e-3)^2 / 2.
      expect(Math.abs(valueOf(r['SFDR (dBFS)']) - 10 * Math.log10(0.5 / ((0.5e-3) ** 2 / 2)))).toBeLessThan(0.05);
    }
  });

  test('when the window leakage is the largest spur, SFDR says so instead of giving a number', () => {
    // Rectangular window side lobes fall only 6 dB per octave from -13 dB (Harris 1978): a tone
    // between bins leaks far above a 16-bit ADC's spurs.
    const x = quantisedSine(1 << 16, 500.5 / 8192, 16, 0.2);
    const r = measure(x, real, { measurements: ['sfdr'], fftSize: 8192, window: 'rectangular' });
    expect(r['SFDR'].value).toBeNull();
    expect(r['SFDR'].flags).toContain('window-limited');
    expect(r['SFDR'].reason).toMatch(/leakage/);
    // A Kaiser window with beta 30 (side lobes far below 200 dB) resolves it.
    const k = measure(x, real, { measurements: ['sfdr', 'sinad'], fftSize: 8192, window: 'kaiser', beta: 30 });
    expect(k['SFDR'].flags ?? []).not.toContain('window-limited');
    // An ideal quantiser's spurs lie below its total quantisation noise (common practice).
    expect(valueOf(k['SFDR'])).toBeGreaterThan(valueOf(k['SINAD']));
  });
});

describe('dead and degenerate input', () => {
  const all = ['tone', 'snr', 'sinad', 'sfdr', 'enob', 'thd', 'obw', 'dc', 'iq-imbalance', 'image-rejection', 'clipping'];

  test.each([
    ['all-zero', new Float32Array(2 * 4096), /every sample is 0/],
    ['one sample', Float32Array.of(0.3, -0.2), /too few|carries any power|could not/],
    ['empty', new Float32Array(0), /no samples/],
  ])('%s capture: no perfect receiver, every readout says why', (_label, x, why) => {
    const r = measure(x, complex, { measurements: all });
    for (const name of ['Tone level', 'SNR', 'SINAD', 'SFDR', 'ENOB', 'Image rejection', 'Image rejection (measured)', 'I/Q gain imbalance (I relative to Q)']) {
      expect(r[name], name).toBeDefined();
      expect(r[name].value, name).toBeNull();
      expect(r[name].reason, name).toMatch(why);
    }
    // results.json keeps the reason beside the null.
    expect(JSON.parse(JSON.stringify(r['Image rejection']))).toMatchObject({ value: null, reason: expect.any(String) });
  });
});

describe('a tone mixed exactly to 0 Hz', () => {
  test('is measured as the tone, flagged, and no silent SNR is given', () => {
    const n = 1 << 15;
    const normal = gaussian(seededRandom(9));
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      x[2 * k] = 0.5 + 1e-3 * normal();
      x[2 * k + 1] = 1e-3 * normal();
    }
    const r = measure(x, complex, { measurements: ['tone', 'snr', 'sfdr', 'dc', 'iq-imbalance'] });
    // A complex tone of amplitude 0.5 at 0 Hz: power 0.25, -6.02 dBFS (common practice).
    expect(Math.abs(valueOf(r['Tone level']) - 20 * Math.log10(0.5))).toBeLessThan(0.05);
    expect(Math.abs(valueOf(r['Tone frequency']))).toBeLessThan(1e6 / 8192);
    expect(r['Tone level'].flags).toContain('tone-at-dc');
    expect(r['SNR'].value).toBeNull();
    expect(r['SNR'].reason).toMatch(/0 Hz/);
    expect(r['SFDR'].value).toBeNull();
    expect(r['DC level'].flags).toContain('holds-tone');
    // The blind imbalance estimate assumes I and Q alike, which a tone at 0 Hz is not.
    expect(r['I/Q gain imbalance (I relative to Q)'].flags).toContain('assumption-fails');
  });
});

describe('image rejection', () => {
  const deg = Math.PI / 180;

  test('near-perfect balance stays finite and follows the small-error form', () => {
    // Razavi, RF Microelectronics, 2nd ed., 2012: IRR ~ 4 / (e^2 + t^2) for small e and t; the
    // textbook denominator 1 - 2 g cos t + g^2 cancels to 0 in floating point here.
    const e = 1e-7;
    const t = 1e-7;
    const irr = imageRejectionDb(1 + e, t);
    expect(Number.isFinite(irr)).toBe(true);
    expect(Math.abs(irr - 10 * Math.log10(4 / (e * e + t * t)))).toBeLessThan(0.01);
  });

  test('measured from the spectrum: tone over image at the level the formula gives', () => {
    // Common practice: a gain/phase mismatch leaves an image at -f at the level the exact
    // formula predicts (Razavi 2012, CHECKS.md: 0.5 dB and 3 deg give 28.20 dB).
    const n = 1 << 16;
    const g = 10 ** (0.5 / 20);
    const x = new Float32Array(2 * n);
    const f = 1000 / n;
    for (let k = 0; k < n; k++) {
      x[2 * k] = 0.5 * g * Math.cos(2 * Math.PI * f * k);
      x[2 * k + 1] = 0.5 * Math.sin(2 * Math.PI * f * k + 3 * deg);
    }
    const r = measure(x, complex, { measurements: ['image-rejection', 'iq-imbalance'], window: 'kaiser', beta: 20 });
    expect(Math.abs(valueOf(r['Image rejection (measured)']) - 28.2)).toBeLessThan(0.02);
    expect(Math.abs(valueOf(r['Image rejection']) - 28.2)).toBeLessThan(0.02);
  });

  test('a tone at fs/2 has no separate image: the measured readout says so and the blind one is flagged', () => {
    const n = 1 << 14;
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      x[2 * k] = 0.5 * (k % 2 === 0 ? 1 : -1) * 1.05;
      x[2 * k + 1] = 0.5 * Math.sin(Math.PI * k + 0.3);
    }
    const r = measure(x, complex, { measurements: ['image-rejection', 'iq-imbalance'] });
    expect(r['Image rejection (measured)'].value).toBeNull();
    expect(r['Image rejection (measured)'].reason).toMatch(/fs\/2/);
    expect(r['I/Q gain imbalance (I relative to Q)'].flags ?? []).toContain('assumption-fails');
  });
});

describe('occupied bandwidth (ITU-R SM.328: 99 %, 0.5 % each side)', () => {
  const fs = 2e6;
  /** A periodic flat band (equal DFT magnitudes, random phases) from `low` to `high` Hz. */
  function flatBand(n: number, low: number, high: number, seed: number, complexOut: boolean): Float32Array {
    const random = seededRandom(seed);
    const x = new Float64Array(complexOut ? 2 * n : n);
    const bins: [number, number][] = [];
    for (let k = 0; k < n; k++) {
      let f = k * (fs / n);
      if (complexOut && f >= fs / 2) f -= fs;
      const inBand = low <= high ? f >= low && f <= high : f >= low || f <= high;
      if (inBand && (complexOut || k <= n / 2)) bins.push([k, 2 * Math.PI * random()]);
    }
    for (let t = 0; t < n; t++) {
      let re = 0;
      let im = 0;
      for (const [k, ph] of bins) {
        re += Math.cos((2 * Math.PI * k * t) / n + ph);
        im += Math.sin((2 * Math.PI * k * t) / n + ph);
      }
      if (complexOut) {
        x[2 * t] = re / bins.length;
        x[2 * t + 1] = im / bins.length;
      } else x[t] = re / bins.length;
    }
    return Float32Array.from(x);
  }

  test('a complex band across +/- fs/2 is measured whole, edges wrapped', () => {
    // Band from 0.8 MHz up through fs/2 = 1 MHz to -0.8 MHz: 400 kHz wide.
    const x = flatBand(2048, 800e3, -800e3, 4, true);
    const r = measure(x, { sampleRate: fs, sampleType: 'complex' }, { measurements: ['obw'], fftSize: 2048, window: 'rectangular' });
    // Common practice: 99 % of a flat band of width B lies in 0.99 B.
    expect(valueOf(r['Occupied bandwidth (99 %)']) / (0.99 * 400e3)).toBeCloseTo(1, 2);
    expect(valueOf(r['Occupied band lower edge'])).toBeGreaterThan(700e3);
    expect(valueOf(r['Occupied band upper edge'])).toBeLessThan(-700e3);
  });

  test('a large DC offset does not widen the band; a real band never reaches beyond fs/2', () => {
    const x = flatBand(2048, -100e3, 300e3, 8, true);
    for (let k = 0; k < x.length; k += 2) x[k] += 0.5;
    const r = measure(x, { sampleRate: fs, sampleType: 'complex' }, { measurements: ['obw'], fftSize: 2048, window: 'rectangular' });
    // The DC lobe is left out (as the tone readouts leave it), so 99 % of the 400 kHz band remains.
    expect(valueOf(r['Occupied bandwidth (99 %)']) / (0.99 * 400e3)).toBeCloseTo(1, 1);

    const y = flatBand(2048, 700e3, 1e6, 6, false);
    const q = measure(y, { sampleRate: fs, sampleType: 'real' }, { measurements: ['obw'], fftSize: 2048, window: 'rectangular' });
    expect(valueOf(q['Occupied band upper edge'])).toBeLessThanOrEqual(fs / 2);
  });
});

describe('clipping and crest factor', () => {
  test('samples at or beyond full scale are counted per channel; a sine has a 3.01 dB crest factor', () => {
    const n = 10_000;
    const x = new Float32Array(2 * n);
    let clippedI = 0;
    for (let k = 0; k < n; k++) {
      const v = 1.3 * Math.cos(0.01 * k);
      x[2 * k] = Math.max(-1, Math.min(1, v));
      if (Math.abs(x[2 * k]) >= 1) clippedI++;
      x[2 * k + 1] = 0.5 * Math.sin(0.01 * k);
    }
    const r = measure(x, complex, { measurements: ['clipping'] });
    expect(valueOf(r['Clipped samples I'])).toBe(clippedI);
    expect(valueOf(r['Clipped samples Q'])).toBe(0);

    // Common practice: a sine's peak is sqrt(2) times its RMS, 20 log10 sqrt(2) = 3.01 dB.
    const s = new Float32Array(1 << 14).map((_, k) => 0.7 * Math.sin((2 * Math.PI * 64 * k) / (1 << 14)));
    const c = measure(s, real, { measurements: ['clipping', 'sinad'] });
    expect(valueOf(c['Crest factor'])).toBeCloseTo(3.0103, 3);
    expect(valueOf(c['Clipped samples'])).toBe(0);
    expect(c['SINAD'].flags ?? []).not.toContain('clipped');
  });
});

describe('captures shorter than the FFT size', () => {
  test('spectral readouts are flagged as start-up transient', () => {
    // Common practice: a segment shorter than the FFT is analysed with a shorter, zero-padded window.
    const x = new Float32Array(1000).map((_, k) => 0.5 * Math.sin(0.3 * k));
    const r = measure(x, real, { measurements: ['tone', 'sfdr', 'sinad'], fftSize: 8192 });
    expect(r['Tone level'].flags).toContain('start-up-transient');
    expect(r['SFDR'].flags ?? []).toContain('start-up-transient');
    const long = measure(new Float32Array(1 << 14).map((_, k) => 0.5 * Math.sin(0.3 * k)), real, { measurements: ['tone'], fftSize: 1024 });
    expect(long['Tone level'].flags ?? []).not.toContain('start-up-transient');
  });
});
