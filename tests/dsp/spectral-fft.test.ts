import { describe, expect, test } from 'vitest';
import { FftPlan, cachedPlanCount, fft, getFftPlan, ifft, realFft } from '@/dsp/fft';
import { loadSpectralFixture, maxAbs, maxAbsDiff } from './spectral-fixtures';

interface FftCase {
  n: number;
  complexInput: number[];
  complexOutput: number[];
  realInput: number[];
  realOutput: number[];
}

describe('FFT against numpy.fft', () => {
  const fixture = loadSpectralFixture<{ cases: FftCase[] }>('fft.json');
  test.each(fixture.cases.map((c) => [c.n, c]))('n = %i', (_n, c) => {
    // Reference: numpy.fft.fft and numpy.fft.rfft (versions recorded in fft.json).
    const scale = maxAbs(c.complexOutput);
    expect(maxAbsDiff(fft(c.complexInput), c.complexOutput) / scale).toBeLessThan(1e-12);
    const rscale = maxAbs(c.realOutput);
    expect(maxAbsDiff(realFft(c.realInput), c.realOutput) / rscale).toBeLessThan(1e-12);
    // The inverse returns the input (scaled by 1/n, like numpy.fft.ifft).
    expect(maxAbsDiff(ifft(c.complexOutput), c.complexInput)).toBeLessThan(1e-12);
  });

  test('a plan runs many times into caller buffers, full real spectrum on request', () => {
    const plan = new FftPlan(16);
    const x = new Float64Array(16).map((_, k) => Math.cos((2 * Math.PI * 3 * k) / 16));
    const out = new Float64Array(32);
    plan.forwardReal(x, out, true);
    // A real cosine of amplitude 1 at bin 3 gives n/2 at bins 3 and n-3 (DFT definition).
    expect(out[6]).toBeCloseTo(8, 12);
    expect(out[2 * 13]).toBeCloseTo(8, 12);
    expect(() => plan.forward(out, out)).toThrow(/different arrays/);
  });

  test('plan cache is bounded', () => {
    for (let p = 1; p <= 14; p++) getFftPlan(1 << p);
    expect(cachedPlanCount()).toBeLessThanOrEqual(8);
    expect(getFftPlan(1024)).toBe(getFftPlan(1024));
  });

  test('bad sizes are refused with the field named', () => {
    expect(() => new FftPlan(12)).toThrow(/size: must be a power of two/);
    expect(() => fft([1, 2, 3])).toThrow(/odd/);
    expect(() => realFft([1, 2, 3])).toThrow(/input length: must be a power of two/);
  });
});
