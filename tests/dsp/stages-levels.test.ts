/** dc-remove, gain and trim on synthesized signals. */
import { describe, expect, it } from 'vitest';
import type { StreamFormat } from '@/dsp/types';
import { dcRemoveStage, gainStage, trimStage } from '@/dsp/stages/index';
import { rmsLevel, peakLevel } from '@/dsp/stages/gain';
import { complexTone, dftAt, realTone, runStage } from './stages-helpers';

const fs = 1e6;
const complex: StreamFormat = { sampleRate: fs, sampleType: 'complex' };
const real: StreamFormat = { sampleRate: fs, sampleType: 'real' };

describe('dc-remove', () => {
  const N = 32_768;
  const tone = complexTone(N, 125e3, fs, 0.5);
  const withDc = tone.map((v, i) => v + (i % 2 === 0 ? 0.1 : -0.2));

  it('mean: subtracts the mean of the head and leaves the tone', () => {
    const y = runStage(dcRemoveStage, { method: 'mean', estimateSamples: 4096 }, complex, [withDc]);
    // A DC offset shows as a spur at 0 Hz (common practice); it must be gone.
    expect(dftAt(withDc, 0, fs).magnitude).toBeCloseTo(Math.hypot(0.1, 0.2), 5);
    expect(dftAt(y, 0, fs).magnitude).toBeLessThan(1e-6);
    expect(dftAt(y, 125e3, fs).magnitude).toBeCloseTo(0.5, 6);
    // The head is corrected too, not passed through.
    expect(y[0]).toBeCloseTo(tone[0], 6);
    expect(y[1]).toBeCloseTo(tone[1], 6);
  });

  it('blocker: notches 0 Hz and passes a tone with the one-pole gain |1 - z^-1| / |1 - p z^-1|', () => {
    const pole = 0.999;
    const y = runStage(dcRemoveStage, { method: 'blocker', pole }, complex, [withDc]);
    const settled = y.subarray(2 * 16_384);
    expect(dftAt(settled, 0, fs).magnitude).toBeLessThan(1e-4);
    // Common practice: H(e^{jw}) = (1 - e^{-jw}) / (1 - p e^{-jw}).
    const w = (2 * Math.PI * 125e3) / fs;
    const expected = Math.hypot(1 - Math.cos(w), Math.sin(w)) / Math.hypot(1 - pole * Math.cos(w), pole * Math.sin(w));
    expect(dftAt(settled, 125e3, fs).magnitude).toBeCloseTo(0.5 * expected, 5);
  });

  it('blocker: a constant DC gives no start-up step', () => {
    const dc = new Float32Array(1000).fill(0.25);
    const y = runStage(dcRemoveStage, { method: 'blocker' }, real, [dc]);
    expect(Math.max(...Array.from(y, Math.abs))).toBe(0);
  });

  it('blocker: a large first sample (a tone starting at its peak on top of DC) leaves no decaying step', () => {
    // Common practice: the one-pole blocker's step response decays with time constant
    // 1 / (1 - pole) samples. A blocker started from x[0] = DC + 0.4 would carry a -0.4 step that
    // averages about -0.25 over its first time constant; primed from the mean, none is left.
    const pole = 0.999;
    const n = 20_000;
    const x = new Float32Array(n).map((_, k) => 0.5 + 0.4 * Math.cos((2 * Math.PI * 50e3 * k) / fs));
    const y = runStage(dcRemoveStage, { method: 'blocker', pole }, real, [x]);
    const first = y.subarray(0, 1000).reduce((s, v) => s + v, 0) / 1000;
    expect(Math.abs(first)).toBeLessThan(0.005);
    // The tone itself passes from the first sample on (gain |H| at 50 kHz within 0.1 %).
    expect(y[0]).toBeCloseTo(0.4, 2);
  });

  it('rejects a pole outside 0.9..0.999999', () => {
    expect(dcRemoveStage.schema.safeParse({ method: 'blocker', pole: 0.5 }).success).toBe(false);
    expect(dcRemoveStage.schema.safeParse({ method: 'blocker', pole: 1 }).success).toBe(false);
  });
});

describe('gain', () => {
  it('fixed: 20 log10(2) dB doubles every value', () => {
    const x = realTone(1000, 1000, fs, 0.3);
    const y = runStage(gainStage, { mode: 'fixed', gainDb: 20 * Math.log10(2) }, real, [x]);
    for (let n = 0; n < 1000; n += 77) expect(y[n]).toBeCloseTo(2 * x[n], 6);
  });

  it('rms: a complex tone of amplitude 0.1 (-20 dBFS) normalised to -10 dBFS', () => {
    const x = complexTone(10_000, 3000, fs, 0.1);
    expect(20 * Math.log10(rmsLevel(x, 'complex'))).toBeCloseTo(-20, 5);
    const y = runStage(gainStage, { mode: 'rms', targetDb: -10, estimateSamples: 5000 }, complex, [x]);
    expect(20 * Math.log10(rmsLevel(y, 'complex'))).toBeCloseTo(-10, 4);
  });

  it('rms: a full-scale real sine reads -3.01 dBFS', () => {
    // Common practice: the RMS of a sine is its amplitude / sqrt(2).
    expect(20 * Math.log10(rmsLevel(realTone(1000, 1000, fs), 'real'))).toBeCloseTo(-3.0103, 3);
  });

  it('peak: brings the largest |x| to the target', () => {
    const x = realTone(1000, 1000, fs, 0.5);
    const y = runStage(gainStage, { mode: 'peak', targetDb: -1 }, real, [x]);
    expect(peakLevel(y, 'real')).toBeCloseTo(Math.pow(10, -1 / 20), 5);
  });

  it('peak of a complex stream is max |z|', () => {
    const x = complexTone(1000, 1000, fs, 0.25);
    const y = runStage(gainStage, { mode: 'peak', targetDb: 0 }, complex, [x]);
    expect(peakLevel(y, 'complex')).toBeCloseTo(1, 5);
  });

  it('a silent head leaves the stream unchanged', () => {
    const x = new Float32Array(100);
    const y = runStage(gainStage, { mode: 'rms', targetDb: 0 }, real, [x]);
    expect(Array.from(y)).toEqual(Array.from(x));
  });
});

describe('trim', () => {
  const x = new Float32Array(2 * 10_000).map((_, i) => i);

  it('keeps [start, start + duration) in seconds', () => {
    const y = runStage(trimStage, { start: 0.001, duration: 0.002 }, complex, [x]);
    expect(y.length).toBe(2 * 2000);
    expect(y[0]).toBe(2 * 1000);
    expect(y[y.length - 1]).toBe(2 * 2999 + 1);
  });

  it('duration 0 keeps everything after start; a start past the end keeps nothing', () => {
    expect(runStage(trimStage, { start: 0.009 }, complex, [x]).length).toBe(2 * 1000);
    expect(runStage(trimStage, { start: 1 }, complex, [x]).length).toBe(0);
    expect(runStage(trimStage, {}, complex, [x]).length).toBe(x.length);
  });

  it('rejects a negative start and warns about a window shorter than a sample', () => {
    expect(trimStage.schema.safeParse({ start: -1 }).success).toBe(false);
    const { issues } = trimStage.propagate(trimStage.schema.parse({ duration: 1e-7 }), complex);
    expect(issues[0]).toMatchObject({ code: 'duration-below-one-sample', field: 'duration' });
  });
});
