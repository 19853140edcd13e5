import { describe, expect, it } from 'vitest';
import { createFilterDecimateProcessor, decimateSchema, decimateStage, antiAliasTaps } from '@/dsp/stages/decimate';
import { filterStage, unstableFilterIssue } from '@/dsp/stages/filter';
import { getStageDefinition } from '@/dsp/stages/index';
import { designFilter, filterResponse, filterSchema, frequencyResponse, windowedSincTaps } from '@/dsp/filters';
import type { StreamFormat } from '@/dsp/types';
import { runChain } from '@/dsp/chain/runner';
import { maxAbsoluteError } from './filters-fixtures';

const complex10M: StreamFormat = { sampleRate: 10e6, sampleType: 'complex' };
const parseFilter = (p: unknown) => filterSchema.parse(p);

describe('filter stage parameters', () => {
  it('fills defaults per design', () => {
    expect(parseFilter({ design: 'window', cutoff: 1000 })).toEqual({ design: 'window', response: 'lowpass', cutoff: 1000, taps: 127, window: 'hamming', beta: 8.6 });
    expect(parseFilter({ design: 'iir', cutoff: 1000 })).toMatchObject({ family: 'butterworth', order: 4, ripple: 1 });
    expect(parseFilter({ design: 'kaiser', cutoff: 1000, transition: 100 })).toMatchObject({ attenuation: 60 });
  });

  it('names the field of every problem', () => {
    const issues = (p: unknown) => filterSchema.safeParse(p).error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`) ?? [];
    expect(issues({ design: 'window' })).toEqual(['cutoff: is required for a lowpass filter (Hz)']);
    expect(issues({ design: 'window', response: 'bandpass', low: 300, high: 200 })).toEqual(['low: must lie below high (200 Hz)']);
    expect(issues({ design: 'window', response: 'highpass', cutoff: 10, taps: 64 })[0]).toMatch(/^taps: must be odd/);
    expect(issues({ design: 'window', cutoff: -5 })).toEqual(['cutoff: must be > 0 Hz']);
    expect(issues({ design: 'fir', cutoff: 5 })[0]).toMatch(/^design: must be one of 'window', 'kaiser', 'taps', 'iir'/);
    expect(issues({ design: 'taps', coefficients: [] })[0]).toMatch(/^coefficients:/);
    expect(issues({ design: 'iir', cutoff: 5, order: 21 })[0]).toMatch(/^order:/);
    expect(issues({ design: 'window', cutoff: 5, bogus: 1 })[0]).toMatch(/bogus/);
  });
});

describe('filter stage propagation', () => {
  it('is registered under its kind', () => {
    expect(getStageDefinition('filter')).toBe(filterStage);
    expect(getStageDefinition('decimate')).toBe(decimateStage);
  });

  it('reports a cut-off at or above Nyquist as an error on the field', () => {
    const { issues, output } = filterStage.propagate(parseFilter({ design: 'window', cutoff: 5e6 }), complex10M);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ severity: 'error', code: 'cutoff-above-nyquist', field: 'cutoff' });
    expect(issues[0].message).toMatch(/5000000 Hz is at or above the Nyquist frequency 5000000 Hz/);
    expect(output).toEqual(complex10M);
    const band = filterStage.propagate(parseFilter({ design: 'iir', response: 'bandstop', low: 1e6, high: 6e6 }), complex10M);
    expect(band.issues[0]).toMatchObject({ code: 'cutoff-above-nyquist', field: 'high' });
  });

  it('sets bandLimit where the designed response stays 40 dB down (window design)', () => {
    const params = parseFilter({ design: 'window', cutoff: 400e3, taps: 127 });
    const { output, issues } = filterStage.propagate(params, complex10M);
    expect(issues).toEqual([]);
    const edge = output.bandLimit!;
    // Hamming main lobe: the stop band starts about 3.3 fs / N / 2 past the cut-off (common practice).
    expect(edge).toBeGreaterThan(450e3);
    expect(edge).toBeLessThan(560e3);
    const design = designFilter(params, 10e6);
    const grid = Array.from({ length: 400 }, (_, i) => edge + (i * (5e6 - edge)) / 399);
    expect(Math.max(...frequencyResponse(design, 10e6, grid).magnitudeDb)).toBeLessThan(-40);
    expect(frequencyResponse(design, 10e6, [edge - 5e3]).magnitudeDb[0]).toBeGreaterThan(-40);
  });

  it('uses the Kaiser design edge, keeps a tighter incoming limit, and leaves high-pass alone', () => {
    const kaiser = filterStage.propagate(parseFilter({ design: 'kaiser', cutoff: 1e6, transition: 200e3, attenuation: 70 }), complex10M);
    expect(kaiser.output.bandLimit).toBeCloseTo(1.1e6, 6);
    const narrower = filterStage.propagate(parseFilter({ design: 'kaiser', cutoff: 1e6, transition: 200e3 }), { ...complex10M, bandLimit: 500e3 });
    expect(narrower.output.bandLimit).toBe(500e3);
    const hp = filterStage.propagate(parseFilter({ design: 'iir', response: 'highpass', cutoff: 1e6 }), { ...complex10M, bandLimit: 3e6 });
    expect(hp.output.bandLimit).toBe(3e6);
    const hpFree = filterStage.propagate(parseFilter({ design: 'window', response: 'highpass', cutoff: 1e6, taps: 63 }), complex10M);
    expect(hpFree.output.bandLimit).toBeUndefined();
    // A short rectangular window never gets 40 dB down: it does not band-limit the stream.
    const weak = filterStage.propagate(parseFilter({ design: 'window', cutoff: 1e6, taps: 15, window: 'rectangular' }), complex10M);
    expect(weak.output.bandLimit).toBeUndefined();
  });

  it('band-limits with an IIR low-pass where its roll-off reaches -40 dB', () => {
    const { output } = filterStage.propagate(parseFilter({ design: 'iir', cutoff: 1e6, order: 6 }), complex10M);
    // Butterworth: 6th order is 40 dB down at 10^(40/120) = 2.15 x the (analogue) cut-off; warping pulls it lower.
    expect(output.bandLimit).toBeGreaterThan(1.9e6);
    expect(output.bandLimit).toBeLessThan(2.2e6);
  });

  it('reports a design error against its field', () => {
    const { issues } = filterStage.propagate(parseFilter({ design: 'kaiser', cutoff: 1e6, transition: 1 }), complex10M);
    expect(issues[0]).toMatchObject({ severity: 'error', code: 'invalid-parameter', field: 'transition' });
  });

  it('reports an unstable cascade as an error', () => {
    expect(unstableFilterIssue([[1, 0, 0, 1, -1, 1.21]])).toMatchObject({ severity: 'error', code: 'unstable-filter' });
    expect(unstableFilterIssue([[1, 2, 1, 1, -1.8, 0.81]])).toBeUndefined();
  });

  it('exposes the design response for plots', () => {
    const design = designFilter(parseFilter({ design: 'iir', family: 'chebyshev1', cutoff: 1e6, order: 4, ripple: 0.5 }), 10e6);
    const r = filterResponse(design, 10e6, 101);
    expect(r.frequencies).toHaveLength(101);
    expect(r.frequencies[100]).toBe(5e6);
    expect(r.magnitudeDb[0]).toBeCloseTo(-0.5, 9);
    expect(r.groupDelay.slice(0, 100).every(Number.isFinite)).toBe(true);
    // The bilinear transform puts the zeros at Nyquist: no phase there, so no delay either.
    expect(r.groupDelay[100]).toBeNaN();
    expect(r.magnitudeDb[100]).toBeLessThan(-200);
  });

  it('filters real and complex streams with the designed taps', () => {
    const params = parseFilter({ design: 'window', cutoff: 1e6, taps: 31 });
    const taps = windowedSincTaps({ response: 'lowpass', cutoff: 1e6, taps: 31, window: 'hamming', sampleRate: 10e6 });
    const impulse = new Float32Array(2 * 40);
    impulse[0] = 1;
    const y = filterStage.create(params, complex10M).process(impulse);
    for (let n = 0; n < 31; n++) expect(y[2 * n]).toBeCloseTo(taps[n], 7);
    const real = filterStage.create(params, { sampleRate: 10e6, sampleType: 'real' }).process(new Float32Array([1, 0, 0]));
    expect(Array.from(real)).toEqual([Math.fround(taps[0]), Math.fround(taps[1]), Math.fround(taps[2])]);
  });
});

describe('decimate stage', () => {
  it('divides the rate and warns when nothing band-limits the stream', () => {
    const { output, issues } = decimateStage.propagate(decimateSchema.parse({ factor: 8, antiAlias: false }), complex10M);
    expect(output.sampleRate).toBe(1.25e6);
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ severity: 'warning', code: 'decimate-without-anti-alias' });
  });

  it('warns when the incoming band limit lies above the new Nyquist frequency', () => {
    const { output, issues } = decimateStage.propagate(decimateSchema.parse({ factor: 8, antiAlias: false }), { ...complex10M, bandLimit: 700e3 });
    expect(issues[0]).toMatchObject({ severity: 'warning', code: 'decimate-aliasing' });
    expect(output.bandLimit).toBeUndefined();
    const ok = decimateStage.propagate(decimateSchema.parse({ factor: 8, antiAlias: false }), { ...complex10M, bandLimit: 500e3 });
    expect(ok.issues).toEqual([]);
    expect(ok.output.bandLimit).toBe(500e3);
  });

  it('needs no warning with the built-in filter, whose stop band starts at the new Nyquist frequency', () => {
    const { output, issues } = decimateStage.propagate(decimateSchema.parse({ factor: 4 }), complex10M);
    expect(issues).toEqual([]);
    expect(output.bandLimit).toBe(1.25e6);
    const taps = antiAliasTaps(4);
    const fs = 10e6;
    const stop = Array.from({ length: 300 }, (_, i) => 1.25e6 + (i * 3.75e6) / 299);
    // Kaiser design for 80 dB; the estimate is good to about 1 dB (Oppenheim and Schafer, section 7.5.3).
    expect(Math.max(...frequencyResponse({ kind: 'fir', taps }, fs, stop).magnitudeDb)).toBeLessThan(-79);
    const pass = Array.from({ length: 100 }, (_, i) => (i * 1e6) / 99);
    const passDb = frequencyResponse({ kind: 'fir', taps }, fs, pass).magnitudeDb;
    expect(Math.max(...passDb.map(Math.abs))).toBeLessThan(0.01);
  });

  it('keeps every factor-th sample without a filter', () => {
    const x = Float32Array.from({ length: 2 * 20 }, (_, i) => i);
    const y = decimateStage.create(decimateSchema.parse({ factor: 3, antiAlias: false }), complex10M).process(x);
    expect(Array.from(y)).toEqual([0, 1, 6, 7, 12, 13, 18, 19, 24, 25, 30, 31, 36, 37]);
  });

  it('a fused filter + decimate gives the output of the two stages in turn', () => {
    const filterParams = parseFilter({ design: 'window', cutoff: 400e3, taps: 127 });
    const decimateParams = decimateSchema.parse({ factor: 8, antiAlias: false });
    let s = 7;
    const x = Float32Array.from({ length: 2 * 5000 }, () => ((s = (s * 48271) % 2147483647) / 2147483647) * 2 - 1);
    const filtered = filterStage.create(filterParams, complex10M).process(x).slice();
    const separate = decimateStage.create(decimateParams, complex10M).process(filtered).slice();
    const fused = createFilterDecimateProcessor(filterParams, decimateParams, complex10M)!;
    const y = fused.process(x);
    expect(y.length).toBe(separate.length);
    // Same taps, sums in another order (polyphase): equal to float32 rounding.
    expect(maxAbsoluteError(y, separate)).toBeLessThan(1e-6);
    // IIR filters keep every output for their state: no fusion.
    expect(createFilterDecimateProcessor(parseFilter({ design: 'iir', cutoff: 400e3 }), decimateParams, complex10M)).toBeUndefined();
  });

  it('the runner fuses filter + decimate, with the same output as unfused (filter probed)', async () => {
    let seed = 3;
    const x = Float32Array.from({ length: 2 * 30000 }, () => ((seed = (seed * 48271) % 2147483647) / 2147483647) * 2 - 1);
    const blocks = [x.subarray(0, 2 * 7001), x.subarray(2 * 7001, 2 * 20000), x.subarray(2 * 20000)];
    const collect = async (probeFilter: boolean) => {
      const doc = {
        version: 1 as const,
        name: 'fusion',
        stages: [
          { id: 'lp', kind: 'filter', params: { design: 'window', cutoff: 400e3, taps: 127 }, probe: probeFilter, bypass: false },
          { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false }, probe: false, bypass: false },
        ],
      };
      const parts: number[] = [];
      const result = await runChain(doc as never, complex10M, blocks, { onOutput: (b) => void parts.push(...b) });
      return { out: Float32Array.from(parts), result };
    };
    const fused = await collect(false);
    const plain = await collect(true);
    expect(fused.result.outputFormat.sampleRate).toBe(1.25e6);
    expect(fused.out.length).toBe(2 * Math.ceil(30000 / 8));
    expect(fused.out.length).toBe(plain.out.length);
    expect(maxAbsoluteError(fused.out, plain.out)).toBeLessThan(1e-6);
  });
});
