import { describe, expect, it } from 'vitest';
import fili from 'fili';
import {
  frequencyResponse,
  kaiserBeta,
  kaiserLength,
  kaiserTaps,
  windowedSincTaps,
  type DesignWindow,
  type FilterResponse,
} from '@/dsp/filters';
import { loadFilterFixture, maxRelativeError } from './filters-fixtures';

interface FirwinCase {
  response: FilterResponse;
  window: string;
  beta: number | null;
  numtaps: number;
  sampleRate: number;
  cutoff?: number;
  low?: number;
  high?: number;
  taps: number[];
  frequencies: number[];
  magnitudeDb: number[];
  phase: number[];
}

const WINDOW_NAMES: Record<string, DesignWindow> = {
  hamming: 'hamming',
  hann: 'hann',
  blackman: 'blackman',
  blackmanharris: 'blackman-harris',
  boxcar: 'rectangular',
  kaiser: 'kaiser',
};

/** Compare a response with SciPy's: 0.01 dB where SciPy is above -60 dB, phase (mod 2 pi) there too. */
function expectResponseMatches(taps: Float64Array, c: { sampleRate: number; frequencies: number[]; magnitudeDb: number[]; phase: number[] }) {
  const r = frequencyResponse({ kind: 'fir', taps }, c.sampleRate, c.frequencies);
  for (let i = 0; i < c.frequencies.length; i++) {
    if (c.magnitudeDb[i] > -60) {
      expect(Math.abs(r.magnitudeDb[i] - c.magnitudeDb[i])).toBeLessThan(0.01);
      const d = r.phase[i] - c.phase[i];
      expect(Math.abs(d - 2 * Math.PI * Math.round(d / (2 * Math.PI)))).toBeLessThan(1e-6);
    } else {
      // Deep in the stop band compare linear magnitudes: dB of a near-zero is ill-conditioned.
      expect(Math.abs(10 ** (r.magnitudeDb[i] / 20) - 10 ** (c.magnitudeDb[i] / 20))).toBeLessThan(1e-7);
    }
  }
}

describe('windowed-sinc FIR design against scipy.signal.firwin', () => {
  const fixture = loadFilterFixture<FirwinCase>('firwin.json');

  it('records the SciPy version that produced the reference', () => {
    expect(fixture.versions.scipy).toMatch(/^\d+\.\d+/);
    expect(fixture.cases.length).toBeGreaterThan(40);
  });

  for (const c of fixture.cases) {
    const label = `${c.response} ${c.window} ${c.numtaps} taps`;
    it(`${label}: taps and response match firwin (SciPy reference vectors)`, () => {
      const taps = windowedSincTaps({
        response: c.response,
        taps: c.numtaps,
        window: WINDOW_NAMES[c.window],
        beta: c.beta ?? undefined,
        cutoff: c.cutoff,
        low: c.low,
        high: c.high,
        sampleRate: c.sampleRate,
      });
      // Both in float64: far tighter than float32 needs (1e-6), loose enough for libm differences.
      expect(maxRelativeError(taps, c.taps)).toBeLessThan(1e-9);
      expectResponseMatches(taps, c);
    });
  }

  it('agrees with fili where its design is right (Hamming low-pass, order N gives N + 1 taps)', () => {
    // fili 2.0.3 FirCoeffs.lowpass: Hamming windowed sinc with Fc at -6 dB and unit DC gain.
    const theirs = new fili.FirCoeffs().lowpass({ order: 126, Fs: 10e6, Fc: 400e3 });
    const ours = windowedSincTaps({ response: 'lowpass', taps: 127, window: 'hamming', cutoff: 400e3, sampleRate: 10e6 });
    expect(maxRelativeError(ours, theirs)).toBeLessThan(1e-12);
  });

  it('places the cut-off at the -6 dB point (common practice for window designs)', () => {
    const taps = windowedSincTaps({ response: 'lowpass', taps: 255, window: 'blackman', cutoff: 1000, sampleRate: 8000 });
    const r = frequencyResponse({ kind: 'fir', taps }, 8000, [0, 1000]);
    expect(r.magnitudeDb[0]).toBeCloseTo(0, 6);
    expect(r.magnitudeDb[1]).toBeCloseTo(20 * Math.log10(0.5), 2);
  });

  it('rejects impossible designs with errors naming the field', () => {
    const base = { response: 'lowpass' as const, taps: 31, window: 'hamming' as const, sampleRate: 1000 };
    expect(() => windowedSincTaps({ ...base, cutoff: 500 })).toThrow(/cutoff: 500 Hz must lie below the Nyquist frequency 500 Hz/);
    expect(() => windowedSincTaps({ ...base, cutoff: 0 })).toThrow(/cutoff: must be > 0 Hz/);
    expect(() => windowedSincTaps({ ...base })).toThrow(/cutoff: required/);
    expect(() => windowedSincTaps({ ...base, response: 'highpass', taps: 30, cutoff: 100 })).toThrow(/taps: must be odd/);
    expect(() => windowedSincTaps({ ...base, response: 'bandpass', low: 200, high: 100 })).toThrow(/low: 200 Hz must lie below high/);
    expect(() => windowedSincTaps({ ...base, taps: 0, cutoff: 100 })).toThrow(/taps: must be an integer/);
  });
});

interface KaiserCase {
  kind: 'beta' | 'order' | 'design';
  attenuation: number;
  beta: number;
  transition?: number;
  sampleRate?: number;
  numtaps?: number;
  response?: FilterResponse;
  cutoff?: number;
  low?: number;
  high?: number;
  taps?: number[];
  frequencies?: number[];
  magnitudeDb?: number[];
  phase?: number[];
}

describe('Kaiser design', () => {
  it('beta from attenuation matches the published values', () => {
    // Oppenheim and Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010, section 7.5.3
    // (J. F. Kaiser, 1974): beta(65) = 6.20426, beta(60) = 5.65326, beta(50) = 4.53351, beta(40) = 3.39532.
    expect(kaiserBeta(65)).toBeCloseTo(6.20426, 5);
    expect(kaiserBeta(60)).toBeCloseTo(5.65326, 5);
    expect(kaiserBeta(50)).toBeCloseTo(4.53351, 5);
    expect(kaiserBeta(40)).toBeCloseTo(3.39532, 5);
    // Same source: beta is 0 below 21 dB (the rectangular window already reaches 21 dB).
    expect(kaiserBeta(20)).toBe(0);
  });

  it('length for 65 dB and a 0.0375 x Nyquist transition is 213 taps', () => {
    // Oppenheim and Schafer, 3rd ed., section 7.5.3: M = (A - 8) / (2.285 dw) -> 213 taps.
    const fs = 2;
    expect(kaiserLength(65, 0.0375 * (fs / 2), fs)).toBe(213);
  });

  const fixture = loadFilterFixture<KaiserCase>('kaiser.json');
  for (const c of fixture.cases) {
    if (c.kind === 'beta') {
      it(`beta(${c.attenuation} dB) matches scipy.signal.kaiser_beta (SciPy reference vectors)`, () => {
        expect(kaiserBeta(c.attenuation)).toBeCloseTo(c.beta, 12);
      });
    } else if (c.kind === 'order') {
      it(`length for ${c.attenuation} dB, ${c.transition} Hz matches scipy.signal.kaiserord (SciPy reference vectors)`, () => {
        expect(kaiserLength(c.attenuation, c.transition!, c.sampleRate!)).toBe(c.numtaps);
      });
    } else {
      it(`${c.response} ${c.attenuation} dB design matches kaiserord + firwin (SciPy reference vectors)`, () => {
        const d = kaiserTaps({
          response: c.response!,
          attenuation: c.attenuation,
          transition: c.transition!,
          cutoff: c.cutoff,
          low: c.low,
          high: c.high,
          sampleRate: c.sampleRate!,
        });
        expect(d.taps.length).toBe(c.numtaps);
        expect(d.beta).toBeCloseTo(c.beta, 12);
        expect(maxRelativeError(d.taps, c.taps!)).toBeLessThan(1e-9);
        expectResponseMatches(d.taps, c as Required<KaiserCase> & { sampleRate: number });
      });
    }
  }

  it('reaches the requested attenuation beyond the transition band', () => {
    const fs = 1e6;
    const d = kaiserTaps({ response: 'lowpass', cutoff: 100e3, transition: 20e3, attenuation: 70, sampleRate: fs });
    const stop = Array.from({ length: 200 }, (_, i) => 110e3 + (i * (fs / 2 - 110e3)) / 200);
    const r = frequencyResponse({ kind: 'fir', taps: d.taps }, fs, stop);
    // Kaiser's formulas are estimates good to about a dB (Oppenheim and Schafer, section 7.5.3).
    expect(Math.max(...r.magnitudeDb)).toBeLessThan(-69);
  });

  it('a ripple tighter than the attenuation sets the design (common practice: equal deviations)', () => {
    const loose = kaiserTaps({ response: 'lowpass', cutoff: 100, transition: 20, attenuation: 40, sampleRate: 1000 });
    const tight = kaiserTaps({ response: 'lowpass', cutoff: 100, transition: 20, attenuation: 40, ripple: 0.01, sampleRate: 1000 });
    // 0.01 dB peak-to-peak: delta = (10^(0.01/20) - 1) / (10^(0.01/20) + 1) -> 64.8 dB.
    expect(tight.attenuation).toBeCloseTo(64.76, 1);
    expect(tight.taps.length).toBeGreaterThan(loose.taps.length);
  });

  it('agrees with fili kbFilter (Kaiser, its own window sum converges to 1e-6 only)', () => {
    // fili kbFilter(Fa = 0, Fb = cut-off) is a Kaiser low-pass without DC normalisation.
    const fs = 1000;
    const theirs = new fili.FirCoeffs().kbFilter({ order: 101, Fs: fs, Fa: 0, Fb: 100, Att: 60 });
    const ours = windowedSincTaps({ response: 'lowpass', taps: 101, window: 'kaiser', beta: kaiserBeta(60), cutoff: 100, sampleRate: fs });
    const dc = theirs.reduce((s, v) => s + v, 0);
    expect(maxRelativeError(ours, theirs.map((v) => v / dc))).toBeLessThan(1e-5);
  });

  it('rejects too little attenuation or a transition that does not fit', () => {
    expect(() => kaiserLength(5, 10, 1000)).toThrow(/attenuation: must be >= 8 dB/);
    expect(() => kaiserLength(60, 600, 1000)).toThrow(/transition: must be > 0 Hz and below the Nyquist frequency/);
    expect(() => kaiserTaps({ response: 'lowpass', cutoff: 100, transition: 1e-6, attenuation: 60, sampleRate: 1000 })).toThrow(/transition: .* taps, more than 65535/);
  });
});
