import { describe, expect, test } from 'vitest';
import { MinMaxTraceReducer, reduceMinMax, reduceSpectrumMax } from '@/dsp/spectral';
import { randomBlocks, seededRandom } from './spectral-fixtures';

describe('min/max trace reducer', () => {
  test('streaming result equals a direct min/max over its columns, for any block split', () => {
    const random = seededRandom(21);
    const n = 100_003;
    const data = new Float32Array(2 * n).map(() => random() * 2 - 1);
    const reducer = new MinMaxTraceReducer({ sampleRate: 1e6, sampleType: 'complex', maxColumns: 300 });
    for (const b of randomBlocks(data, 2, 9, 5000)) reducer.push(b);
    const r = reducer.result();
    expect(r.channels).toHaveLength(2);
    expect(r.channels[0].min.length).toBeLessThanOrEqual(300);
    const per = r.samplesPerColumn;
    expect(Math.ceil(n / per)).toBe(r.channels[0].min.length);
    for (let c = 0; c < 2; c++) {
      const channel = Array.from({ length: n }, (_, k) => data[2 * k + c]);
      const direct = [];
      for (let s = 0; s < n; s += per) direct.push(channel.slice(s, s + per));
      expect(r.channels[c].min).toEqual(direct.map((xs) => Math.min(...xs)));
      expect(r.channels[c].max).toEqual(direct.map((xs) => Math.max(...xs)));
    }
    const whole = new MinMaxTraceReducer({ sampleRate: 1e6, sampleType: 'complex', maxColumns: 300 });
    whole.push(data);
    expect(whole.result()).toEqual(r);
  });

  test('odd maxColumns and short traces', () => {
    const reducer = new MinMaxTraceReducer({ sampleRate: 10, sampleType: 'real', maxColumns: 5 });
    reducer.push(Float32Array.from([1, 2, 3, 4, 5, 6, 7]));
    const r = reducer.result();
    expect(r.samplesPerColumn).toBe(2);
    expect(r.channels[0].min).toEqual([1, 3, 5, 7]);
    expect(r.channels[0].max).toEqual([2, 4, 6, 7]);
  });

  test('pure reducers', () => {
    expect(reduceMinMax([3, 1, 4, 1, 5, 9, 2], 3)).toEqual({ samplesPerColumn: 3, min: [1, 1, 2], max: [4, 9, 2] });
    const s = reduceSpectrumMax([0, 1, 2, 3, 4], [-5, -1, -9, -2, -3], 2);
    expect(s).toEqual({ frequencies: [1, 3], levels: [-1, -2] });
    expect(() => reduceMinMax([1], 0)).toThrow(/columns: must be/);
  });
});
