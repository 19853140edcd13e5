import { describe, expect, test } from 'vitest';
import { estimateIqImbalance, imageRejectionDb, SampleMoments, measureSpectrumOf, binOfFrequency } from '@/dsp/measure';
import { randomBlocks } from './spectral-fixtures';

const deg = Math.PI / 180;
const gainOfDb = (db: number) => 10 ** (db / 20);

describe('image rejection formula', () => {
  // B. Razavi, "RF Microelectronics", 2nd ed., 2012 (image-reject receivers); T. Lee, "The Design
  // of CMOS Radio-Frequency Integrated Circuits", 2nd ed., 2004: IRR = (1 + 2g cos t + g^2) /
  // (1 - 2g cos t + g^2); the five values below are those CHECKS.md lists.
  test.each([
    ['1 % and 1 deg', 1.01, 1 * deg, 39.96],
    ['0.1 dB and 0.5 deg', gainOfDb(0.1), 0.5 * deg, 42.83],
    ['0.5 dB and 3 deg', gainOfDb(0.5), 3 * deg, 28.2],
    ['1 deg alone', 1, 1 * deg, 41.18],
    ['1 dB alone', gainOfDb(1), 0, 24.81],
  ])('%s', (_label, g, t, irr) => {
    expect(Math.abs(imageRejectionDb(g, t) - irr)).toBeLessThanOrEqual(0.005);
  });

  test('the exact form, not the small-error approximation 4/(e^2 + t^2)', () => {
    // Same sources: the approximation is 0.14 dB off at 0.5 dB / 3 deg.
    const g = gainOfDb(0.5);
    const approx = 10 * Math.log10(4 / ((g - 1) ** 2 + (3 * deg) ** 2));
    expect(Math.abs(imageRejectionDb(g, 3 * deg) - approx)).toBeGreaterThan(0.1);
    expect(imageRejectionDb(1, 0)).toBe(Infinity);
    expect(() => imageRejectionDb(0, 0)).toThrow(/gainRatio: must be/);
  });
});

/** A tone through an unbalanced quadrature front end: I = g cos(wt) + dcI, Q = sin(wt + p) + dcQ. */
function unbalancedTone(n: number, cyclesPerSample: number, g: number, p: number, dcI: number, dcQ: number): Float32Array {
  const x = new Float32Array(2 * n);
  for (let k = 0; k < n; k++) {
    const wt = 2 * Math.PI * cyclesPerSample * k;
    x[2 * k] = 0.5 * g * Math.cos(wt) + dcI;
    x[2 * k + 1] = 0.5 * Math.sin(wt + p) + dcQ;
  }
  return x;
}

describe('blind I/Q imbalance estimate', () => {
  // S. W. Ellingson, "Correcting I-Q Imbalance in Direct Conversion Receivers", 2003: after mean
  // removal g = sqrt(<I^2>/<Q^2>), sin p = <IQ>/sqrt(<I^2><Q^2>).
  const g = gainOfDb(0.3);
  const p = 2 * deg;
  const n = 1 << 16;
  // 1000 whole cycles over the capture so the tone's moments are exact.
  const x = unbalancedTone(n, 1000 / n, g, p, 0.02, -0.01);

  test('recovers gain, phase and DC of a tone', () => {
    const e = estimateIqImbalance(x);
    expect(e.gainRatio).toBeCloseTo(g, 5);
    expect(e.phaseRad / deg).toBeCloseTo(2, 3);
    expect(e.dcI).toBeCloseTo(0.02, 6);
    expect(e.dcQ).toBeCloseTo(-0.01, 6);
  });

  test('streaming moments give the same estimate for any block split', () => {
    const whole = estimateIqImbalance(x);
    const moments = new SampleMoments(true);
    for (const b of randomBlocks(x, 2, 4, 3000)) moments.push(b);
    const e = moments.imbalance();
    expect(e.gainRatio).toBeCloseTo(whole.gainRatio, 9);
    expect(e.phaseRad).toBeCloseTo(whole.phaseRad, 9);
    expect(e.dcI).toBeCloseTo(whole.dcI, 9);
  });

  test('the image in the spectrum sits where the image-rejection formula says', () => {
    // Common practice: a gain/phase mismatch leaves an image at -f at the level the formula predicts.
    const fs = 1e6;
    const f = (1000 / n) * fs;
    const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'complex', fftSize: 8192, window: 'blackman-harris' });
    const wanted = spectrum.power[binOfFrequency(spectrum, f)];
    const image = spectrum.power[binOfFrequency(spectrum, -f)];
    const e = estimateIqImbalance(x);
    expect(Math.abs(10 * Math.log10(wanted / image) - imageRejectionDb(e.gainRatio, e.phaseRad))).toBeLessThan(0.05);
  });

  test('bad input', () => {
    expect(() => estimateIqImbalance(new Float32Array(3))).toThrow(/iq: length 3 is odd/);
    expect(() => estimateIqImbalance(new Float32Array(0))).toThrow(/iq: needs at least one/);
    expect(estimateIqImbalance(new Float32Array(8))).toEqual({ gainRatio: 1, phaseRad: 0, dcI: 0, dcQ: 0 });
    expect(() => new SampleMoments(false).imbalance()).toThrow(/complex stream/);
  });
});
