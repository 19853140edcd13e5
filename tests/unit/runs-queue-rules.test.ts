/** Pure rules of the run queue: who goes next, the ETA, CSV columns and plot reduction. */
import { describe, expect, it } from 'vitest';
import { pickNextRun } from '@/lib/server/runs/fairness';
import { estimateSecondsLeft } from '@/lib/server/runs/present';
import { levelColumn, readoutsCsv } from '@/lib/server/runs/export';
import { mergeMinMax, reduceSpectrum } from '@/lib/server/runs/plot';
import { cacheKey, computationHash } from '@/lib/server/runs/cache-key';
import type { RunResults } from '@/lib/server/runs/results';

const queue = (...users: string[]) => users.map((userId, index) => ({ id: `run${index}`, userId }));

describe('pickNextRun', () => {
  it('takes the oldest run when nobody has been served', () => {
    expect(pickNextRun(queue('a', 'a', 'b'), { running: new Map(), limits: new Map(), lastServed: new Map() })?.id).toBe('run0');
  });

  it('lets a user never served go before the rest of a batch', () => {
    const next = pickNextRun(queue('a', 'a', 'a', 'b'), { running: new Map(), limits: new Map(), lastServed: new Map([['a', 1]]) });
    expect(next).toEqual({ id: 'run3', userId: 'b' });
  });

  it('takes turns: the user served longest ago first', () => {
    const next = pickNextRun(queue('a', 'b', 'c'), { running: new Map(), limits: new Map(), lastServed: new Map([['a', 3], ['b', 1], ['c', 2]]) });
    expect(next?.userId).toBe('b');
  });

  it('skips users at their concurrent-run limit, and answers null when everyone is', () => {
    const state = { running: new Map([['a', 2]]), limits: new Map([['a', 2], ['b', 1]]), lastServed: new Map() };
    expect(pickNextRun(queue('a', 'b'), state)?.userId).toBe('b');
    expect(pickNextRun(queue('a', 'a'), state)).toBeNull();
  });
});

describe('run figures', () => {
  it('estimates time left from elapsed time and progress', () => {
    const start = new Date(0).toISOString();
    expect(estimateSecondsLeft(start, 0.25, 10_000)).toBe(30);
    expect(estimateSecondsLeft(start, 0.001, 10_000)).toBeNull();
    expect(estimateSecondsLeft(null, 0.5)).toBeNull();
  });

  it('names level columns after their unit and quotes CSV cells that need it', () => {
    expect(levelColumn('dBFS/Hz')).toBe('level_dBFS_per_Hz');
    expect(levelColumn('dBm')).toBe('level_dBm');
    const probes = [{ stageId: 'm', kind: 'measure', format: { sampleRate: 1, sampleType: 'real' }, readouts: [{ name: 'SNR, in band', value: 41.5, unit: 'dB' }, { name: 'Tone', value: null, unit: 'dBFS' }] }];
    const csv = readoutsCsv({ probes } as unknown as RunResults);
    expect(csv).toBe('probe,name,value,unit\r\nm,"SNR, in band",41.5,dB\r\nm,Tone,,dBFS\r\n');
  });

  it('reduces spectra and traces to the width, keeping peaks and extremes', () => {
    const frequencies = Array.from({ length: 1000 }, (_, k) => k);
    const levels: (number | null)[] = frequencies.map((f) => (f === 437 ? -3 : -90));
    levels[10] = null;
    const reduced = reduceSpectrum(frequencies, levels, 64);
    expect(reduced.frequencies.length).toBeLessThanOrEqual(64);
    expect(Math.max(...(reduced.levels as number[]))).toBe(-3);
    expect(reduced.frequencies[reduced.levels.indexOf(-3)]).toBe(437);
    const merged = mergeMinMax([0, -1, 2, -5, 1], [1, 3, 2, 0, 4], 2);
    expect(merged).toEqual({ group: 3, min: [-1, -5], max: [3, 4] });
  });

  it('keys the cache on what the chain computes, not its name', () => {
    const stages = [{ id: 'g', kind: 'gain', params: { gainDb: 3 } }];
    const a = computationHash({ version: 1, name: 'A', stages });
    expect(computationHash({ version: 1, name: 'B', description: 'renamed', stages })).toBe(a);
    expect(computationHash({ version: 1, name: 'A', stages: [{ ...stages[0], params: { gainDb: 4 } }] })).not.toBe(a);
    expect(cacheKey(a, 'ab'.repeat(32), '1.0.0')).not.toBe(cacheKey(a, 'ab'.repeat(32), '1.0.1'));
  });
});
