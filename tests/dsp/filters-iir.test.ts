import { describe, expect, it } from 'vitest';
import fili from 'fili';
import {
  analogMagnitude,
  besselPrototype,
  butterworthPrototype,
  chebyshev1Prototype,
  designIir,
  frequencyResponse,
  isSosStable,
  sosPoleRadius,
  type FilterResponse,
  type IirFamily,
  type SosMatrix,
} from '@/dsp/filters';
import { loadFilterFixture, maxRelativeError } from './filters-fixtures';

interface IirCase {
  family: IirFamily;
  response: FilterResponse;
  order: number;
  ripple: number | null;
  sampleRate: number;
  cutoff?: number;
  low?: number;
  high?: number;
  sos: number[][];
  frequencies: number[];
  magnitudeDb: number[];
  phase: number[];
}

const db = (x: number) => 20 * Math.log10(x);

describe('IIR design as second-order sections against SciPy', () => {
  const fixture = loadFilterFixture<IirCase>('iir.json');

  it('covers every family and response', () => {
    expect(fixture.versions.scipy).toMatch(/^\d+\.\d+/);
    for (const family of ['butterworth', 'chebyshev1', 'bessel']) {
      for (const response of ['lowpass', 'highpass', 'bandpass', 'bandstop']) {
        expect(fixture.cases.some((c) => c.family === family && c.response === response)).toBe(true);
      }
    }
  });

  for (const c of fixture.cases) {
    const label = `${c.family} ${c.response} order ${c.order}${c.ripple ? ` ripple ${c.ripple} dB` : ''}`;
    it(`${label}: sections and response match butter/cheby1/bessel(norm='phase') (SciPy reference vectors)`, () => {
      const sos = designIir({
        family: c.family,
        response: c.response,
        order: c.order,
        ripple: c.ripple ?? undefined,
        cutoff: c.cutoff,
        low: c.low,
        high: c.high,
        sampleRate: c.sampleRate,
      });
      expect(sos.length).toBe(c.sos.length);
      // Same pairing and ordering as zpk2sos: row by row, relative to each row's largest entry.
      sos.forEach((row, i) => expect(maxRelativeError(row, c.sos[i])).toBeLessThan(1e-9));
      expect(isSosStable(sos)).toBe(true);
      const r = frequencyResponse({ kind: 'iir', sos }, c.sampleRate, c.frequencies);
      for (let i = 0; i < c.frequencies.length; i++) {
        if (c.magnitudeDb[i] > -60) {
          expect(Math.abs(r.magnitudeDb[i] - c.magnitudeDb[i])).toBeLessThan(0.01);
          const d = r.phase[i] - c.phase[i];
          expect(Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI)))).toBeLessThan(1e-6);
        } else {
          expect(Math.abs(10 ** (r.magnitudeDb[i] / 20) - 10 ** (c.magnitudeDb[i] / 20))).toBeLessThan(1e-7);
        }
      }
    });
  }
});

describe('Butterworth published values', () => {
  // S. Butterworth, "On the Theory of Filter Amplifiers", Wireless Engineer 7, 1930:
  // |H(wc)| = -10 log10(2) = -3.0103 dB for every order; -20 n dB/decade beyond the cut-off.
  for (let order = 1; order <= 10; order++) {
    it(`order ${order}: -3.0103 dB at the cut-off (analogue prototype and digital design)`, () => {
      expect(db(analogMagnitude(butterworthPrototype(order), 1))).toBeCloseTo(-3.0103, 4);
      // With pre-warping the digital cut-off lands exactly on the analogue one.
      const sos = designIir({ family: 'butterworth', response: 'lowpass', order, cutoff: 1200, sampleRate: 10000 });
      expect(frequencyResponse({ kind: 'iir', sos }, 10000, [1200]).magnitudeDb[0]).toBeCloseTo(-3.0103, 4);
      const hp = designIir({ family: 'butterworth', response: 'highpass', order, cutoff: 2100, sampleRate: 10000 });
      expect(frequencyResponse({ kind: 'iir', sos: hp }, 10000, [2100]).magnitudeDb[0]).toBeCloseTo(-3.0103, 4);
    });
  }

  it('4th order is -80.0 dB at 10 x the cut-off', () => {
    // Same source, in the analogue sense: 10 log10(1 + 10^8) = 80.0000 dB.
    expect(db(analogMagnitude(butterworthPrototype(4), 10))).toBeCloseTo(-80.0, 3);
    // Digital, pre-warped: the frequency f with tan(pi f / fs) = 10 tan(pi fc / fs) is where the
    // bilinear transform puts the analogue 10 x cut-off.
    const fs = 48000;
    const fc = 1000;
    const sos = designIir({ family: 'butterworth', response: 'lowpass', order: 4, cutoff: fc, sampleRate: fs });
    const f10 = (fs / Math.PI) * Math.atan(10 * Math.tan((Math.PI * fc) / fs));
    expect(frequencyResponse({ kind: 'iir', sos }, fs, [f10]).magnitudeDb[0]).toBeCloseTo(-80.0, 3);
    // Digital at a low normalised cut-off, no correction: warping moves it by only 0.03 dB.
    const low = designIir({ family: 'butterworth', response: 'lowpass', order: 4, cutoff: 10, sampleRate: fs });
    expect(Math.abs(frequencyResponse({ kind: 'iir', sos: low }, fs, [100]).magnitudeDb[0] + 80)).toBeLessThan(0.05);
  });

  it('agrees with fili CalcCascades (even orders; fili puts unit gain in every biquad)', () => {
    // fili 2.0.3 Butterworth cascades: RBJ biquads pre-warped at the cut-off, `order` counts biquads.
    for (const biquads of [1, 2, 3, 4]) {
      const theirs = new fili.CalcCascades().lowpass({ order: biquads, characteristic: 'butterworth', Fs: 10000, Fc: 1200 });
      const theirSos: SosMatrix = theirs.map((s) => [s.k * s.b[0], s.k * s.b[1], s.k * s.b[2], 1, s.a[0], s.a[1]]);
      const ours = designIir({ family: 'butterworth', response: 'lowpass', order: 2 * biquads, cutoff: 1200, sampleRate: 10000 });
      const grid = Array.from({ length: 50 }, (_, i) => i * 100);
      const a = frequencyResponse({ kind: 'iir', sos: ours }, 10000, grid).magnitudeDb;
      const b = frequencyResponse({ kind: 'iir', sos: theirSos }, 10000, grid).magnitudeDb;
      a.forEach((v, i) => expect(Math.abs(v - b[i])).toBeLessThan(1e-6));
    }
  });
});

describe('Chebyshev type I published values', () => {
  // Common textbook result (eps value from memory): Rp = 10 log10(1 + eps^2); 1 dB <-> eps = 0.50885.
  it('1 dB ripple gives eps = 0.50885', () => {
    expect(Math.sqrt(10 ** (1 / 10) - 1)).toBeCloseTo(0.50885, 5);
  });

  for (const ripple of [0.5, 1, 3]) {
    for (let order = 1; order <= 8; order++) {
      it(`order ${order}, ${ripple} dB: DC gain ${order % 2 === 0 ? '-Rp' : '0 dB'} and -Rp at the cut-off`, () => {
        // Common textbook result: even orders start at the bottom of the ripple band, odd at the top.
        const expectedDc = order % 2 === 0 ? -ripple : 0;
        expect(db(analogMagnitude(chebyshev1Prototype(order, ripple), 0))).toBeCloseTo(expectedDc, 9);
        const sos = designIir({ family: 'chebyshev1', response: 'lowpass', order, ripple, cutoff: 1000, sampleRate: 8000 });
        const r = frequencyResponse({ kind: 'iir', sos }, 8000, [0, 1000]);
        expect(r.magnitudeDb[0]).toBeCloseTo(expectedDc, 9);
        // The cut-off is the end of the ripple band: the gain there is -Rp.
        expect(r.magnitudeDb[1]).toBeCloseTo(-ripple, 9);
      });
    }
  }

  it('stays within the ripple band up to the cut-off', () => {
    const sos = designIir({ family: 'chebyshev1', response: 'lowpass', order: 6, ripple: 1, cutoff: 1000, sampleRate: 8000 });
    const grid = Array.from({ length: 201 }, (_, i) => i * 5);
    const r = frequencyResponse({ kind: 'iir', sos }, 8000, grid);
    expect(Math.max(...r.magnitudeDb)).toBeLessThan(1e-9);
    expect(Math.min(...r.magnitudeDb)).toBeGreaterThan(-1 - 1e-9);
  });
});

describe('Bessel', () => {
  it('phase-normalised: unit DC gain and the high-frequency asymptote of a Butterworth of the same order', () => {
    // scipy.signal.bessel documentation (SciPy 1.17), norm='phase': "The magnitude response
    // asymptotes are the same as a Butterworth filter of the same order with a cutoff of Wn".
    for (const order of [1, 2, 3, 4, 6, 9]) {
      const bessel = besselPrototype(order);
      expect(analogMagnitude(bessel, 0)).toBeCloseTo(1, 12);
      const ratio = analogMagnitude(bessel, 1e4) / analogMagnitude(butterworthPrototype(order), 1e4);
      expect(ratio).toBeCloseTo(1, 3);
    }
  });

  it('has a flat group delay in the pass band (maximally flat delay; common practice)', () => {
    const sos = designIir({ family: 'bessel', response: 'lowpass', order: 6, cutoff: 1000, sampleRate: 48000 });
    const r = frequencyResponse({ kind: 'iir', sos }, 48000, [10, 200, 400]);
    expect(Math.abs(r.groupDelay[2] - r.groupDelay[0]) / r.groupDelay[0]).toBeLessThan(0.01);
  });
});

describe('stability', () => {
  it('finds poles outside the unit circle', () => {
    // a2 = 1.21: poles at radius 1.1.
    expect(sosPoleRadius([[1, 0, 0, 1, -1, 1.21]])).toBeCloseTo(1.1, 12);
    expect(isSosStable([[1, 0, 0, 1, -1, 1.21]])).toBe(false);
    // A real pole at 1.0 (first-order section) is on the circle: not stable.
    expect(isSosStable([[1, 1, 0, 1, -1, 0]])).toBe(false);
    expect(isSosStable([[1, 2, 1, 1, -1.8, 0.81]])).toBe(true);
  });

  it('keeps even narrow high-order designs stable', () => {
    const sos = designIir({ family: 'butterworth', response: 'bandpass', order: 10, low: 1000, high: 1010, sampleRate: 48000 });
    expect(sos.length).toBe(10);
    expect(sosPoleRadius(sos)).toBeLessThan(1);
  });

  it('rejects an order out of range or a missing ripple, naming the field', () => {
    expect(() => designIir({ family: 'butterworth', response: 'lowpass', order: 0, cutoff: 10, sampleRate: 100 })).toThrow(/order: must be an integer from 1 to 20/);
    expect(() => designIir({ family: 'chebyshev1', response: 'lowpass', order: 2, cutoff: 10, sampleRate: 100 })).toThrow(/ripple: required/);
    expect(() => designIir({ family: 'bessel', response: 'bandstop', order: 2, low: 10, high: 60, sampleRate: 100 })).toThrow(/high: 60 Hz must lie below the Nyquist/);
  });
});

interface GroupDelayCase {
  kind: 'fir' | 'sos';
  sampleRate: number;
  taps?: number[];
  sos?: number[][];
  frequencies: number[];
  groupDelay: number[];
}

describe('group delay against scipy.signal.group_delay (SciPy reference vectors)', () => {
  const fixture = loadFilterFixture<GroupDelayCase>('group_delay.json');
  fixture.cases.forEach((c, n) => {
    it(`case ${n} (${c.kind})`, () => {
      const design = c.kind === 'fir' ? { kind: 'fir' as const, taps: Float64Array.from(c.taps!) } : { kind: 'iir' as const, sos: c.sos! };
      const r = frequencyResponse(design, c.sampleRate, c.frequencies);
      expect(maxRelativeError(r.groupDelay, c.groupDelay)).toBeLessThan(1e-6);
      r.groupDelaySeconds.forEach((s, i) => expect(s).toBeCloseTo(r.groupDelay[i] / c.sampleRate, 15));
    });
  });

  it('a symmetric FIR delays by (taps - 1) / 2 samples (common practice: linear phase)', () => {
    const taps = Float64Array.from([1, 2, 3, 2, 1]);
    const r = frequencyResponse({ kind: 'fir', taps }, 1000, [0, 100, 200]);
    r.groupDelay.forEach((d) => expect(d).toBeCloseTo(2, 12));
  });
});
