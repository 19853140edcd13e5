/** Pure rules of the run queue: who goes next, the ETA, CSV columns, plot reduction, summaries and the cache key. */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { pickNextRun } from '@/lib/server/runs/fairness';
import { estimateSecondsLeft } from '@/lib/server/runs/present';
import { levelColumn, readoutsCsv } from '@/lib/server/runs/export';
import { mergeMinMax, reducePlot, reduceSpectrum } from '@/lib/server/runs/plot';
import { cacheKey, computationHash } from '@/lib/server/runs/cache-key';
import { PREVIEW_WIDTH, probeDataEntries, summarizeResults } from '@/lib/server/runs/probe-data';
import type { PlotData, RunResults } from '@/contracts/run-results';

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

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
    const testPoints = [
      { stageId: 'm', kind: 'measure', format: { sampleRate: 1, sampleType: 'real' as const }, plots: [], readouts: [{ name: 'SNR, in band', value: 41.5, unit: 'dB' }, { name: 'Tone', value: null, unit: 'dBFS', reason: 'every sample is 0' }, { name: 'DC', value: -3, unit: 'dBFS', flags: ['holds-tone' as const, 'clipped' as const], definition: 'dc-mean' }] },
    ];
    const csv = readoutsCsv({ testPoints });
    // RFC 4180: a cell holding a comma is quoted; an empty cell is nothing between the commas.
    expect(csv).toBe(
      'probe,name,value,unit,flags,reason,definition\r\n' +
        'm,"SNR, in band",41.5,dB,,,\r\n' +
        'm,Tone,,dBFS,,every sample is 0,\r\n' +
        'm,DC,-3,dBFS,holds-tone clipped,,dc-mean\r\n',
    );
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
    // The canonical text written by hand from its documented rules (src/dsp/chain/canonical.ts):
    // version then stages, no name in the computation-only form, every default of the gain stage
    // filled in (src/dsp/stages/gain.ts), parameter keys sorted, then probe and bypass.
    const canonical =
      '{"version":1,"stages":[{"id":"g","kind":"gain","params":{"estimateSamples":262144,"gainDb":3,"mode":"fixed","targetDb":-20},"probe":false,"bypass":false}]}';
    const a = computationHash({ version: 1, name: 'A', stages });
    expect(a).toBe(sha256(canonical));
    expect(computationHash({ version: 1, name: 'B', description: 'renamed', stages })).toBe(a);
    expect(computationHash({ version: 1, name: 'A', stages: [{ ...stages[0], params: { gainDb: 4 } }] })).not.toBe(a);
    // The key's documented layout: a fixed prefix, the chain hash, the capture's sha256 in lower case, the engine version.
    const capture = 'AB'.repeat(32);
    expect(cacheKey(a, capture, '1.0.0')).toBe(sha256(`quadrille-run\n${sha256(canonical)}\n${'ab'.repeat(32)}\n1.0.0`));
    expect(cacheKey(a, capture, '1.0.0')).not.toBe(cacheKey(a, capture, '1.0.1'));
  });
});

describe('summaries and previews', () => {
  const bins = 10_000;
  const frequencies = Array.from({ length: bins }, (_, k) => k * 100 - 500_000);
  // A floor at -100 with one tone bin at +120 kHz and one missing level.
  const levels: (number | null)[] = frequencies.map((f) => (f === 120_000 ? -6 : -100));
  levels[3] = null;
  const results = {
    engineVersion: '1.0.0',
    createdAt: '2026-12-01T00:00:00.000Z',
    chain: { path: '/c', name: 'c', stages: [] },
    input: { path: '/i', container: 'sigmf', datatype: 'cf32_le', layout: 'complex', sampleRate: 1e6, centerFrequency: null, samples: 20_000, durationSeconds: 0.02 },
    output: { meta: 'm', data: 'd', datatype: 'cf32_le', layout: 'complex', sampleRate: 1e6, centerFrequency: null, samples: 20_000 },
    probes: [
      {
        stageId: 'psd',
        kind: 'spectrum',
        format: { sampleRate: 1e6, sampleType: 'complex' as const },
        spectrum: { unit: 'dBFS' as const, peak: { frequency: 120_000, level: -6 }, resolutionBandwidth: 150, segments: 4, frequencies, levels },
        readouts: [{ name: 'Tone', value: -6, unit: 'dBFS' }],
        constellation: Array.from({ length: 2 * 30_000 }, (_, k) => k),
      },
      { stageId: 'meas', kind: 'measure', format: { sampleRate: 1e6, sampleType: 'real' as const }, readouts: [] },
    ],
    issues: [],
    timing: { seconds: 0.5, inputSamplesPerSecond: 40_000 },
  } satisfies RunResults;

  it('lists each test point with its plot kinds, readouts and spectrum figures, without the bins', () => {
    const summary = summarizeResults(results);
    expect(summary.testPoints.map((p) => [p.stageId, p.plots])).toEqual([['psd', ['spectrum', 'constellation']], ['meas', []]]);
    // Median of 9 998 bins at -100 dB and one at -6 dB is -100 dB.
    expect(summary.testPoints[0]!.spectrum).toEqual({ unit: 'dBFS', peak: { frequency: 120_000, level: -6 }, resolutionBandwidth: 150, segments: 4, bins, noiseFloor: -100 });
    expect(JSON.stringify(summary)).not.toContain('"frequencies"');
  });

  it('stores previews no wider than the preview width that reduce again to any width, keeping the peak', () => {
    const entries = probeDataEntries(results);
    expect(entries.map((e) => [e.stageId, e.kind])).toEqual([['psd', 'spectrum'], ['psd', 'constellation']]);
    const preview = JSON.parse(entries[0]!.preview) as Extract<PlotData, { kind: 'spectrum' }>;
    expect(preview.frequencies.length).toBeLessThanOrEqual(PREVIEW_WIDTH);
    expect(preview.bins).toBe(bins);
    expect(JSON.parse(entries[0]!.data).frequencies).toHaveLength(bins);
    const narrow = reducePlot(preview, 100) as typeof preview;
    expect(narrow.frequencies.length).toBeLessThanOrEqual(100);
    expect(Math.max(...(narrow.levels.filter((l) => l !== null) as number[]))).toBe(-6);
    expect(narrow.frequencies[narrow.levels.indexOf(-6)]).toBe(120_000);
    const points = JSON.parse(entries[1]!.preview) as Extract<PlotData, { kind: 'constellation' }>;
    expect(points.points.length / 2).toBeLessThanOrEqual(10_000);
  });
});
