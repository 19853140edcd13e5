// Verdict arithmetic of a specification (common practice for limit tests: a value equal to a
// limit is inside it; a value that could not be measured never passes).
import { describe, expect, it } from 'vitest';
import { judge, judgeRun, newSpecSchema, specLimitSchema } from '@/contracts';

describe('judge', () => {
  it('passes a value equal to either limit, with zero margin', () => {
    expect(judge(30, 30, null)).toEqual({ status: 'pass', margin: 0 });
    expect(judge(-40, null, -40)).toEqual({ status: 'pass', margin: 0 });
  });
  it('gives the distance to the nearer limit, negative outside', () => {
    expect(judge(35, 30, 50)).toEqual({ status: 'pass', margin: 5 });
    expect(judge(28.5, 30, null)).toEqual({ status: 'fail', margin: -1.5 });
    expect(judge(-35, null, -40)).toEqual({ status: 'fail', margin: -5 });
  });
  it('never passes NaN, infinities or a missing value', () => {
    for (const v of [NaN, Infinity, -Infinity, null]) expect(judge(v, -1e9, 1e9).status).toBe('not_measured');
  });
});

describe('judgeRun', () => {
  const spec = {
    id: 's1', name: 'Receiver', version: 2,
    limits: [
      { measurement: 'Image rejection', min: 30 },
      { measurement: 'DC level', max: -40, note: 'req 4.2' },
      { measurement: 'SFDR', min: 60 },
      { measurement: 'SNR', min: 20, test_point: 'measure-b' },
    ],
  };
  it('orders failures first and counts each status', () => {
    const v = judgeRun(spec, [
      { testPoint: 'measure', name: 'Image rejection', value: 35.2, unit: 'dB' },
      { testPoint: 'measure', name: 'DC level', value: -31, unit: 'dBFS' },
      { testPoint: 'measure', name: 'SFDR', value: null, unit: 'dBc', reason: 'window-limited' },
      { testPoint: 'measure', name: 'SNR', value: 50, unit: 'dB' },
    ]);
    expect(v.overall).toBe('fail');
    expect(v.counts).toEqual({ pass: 1, fail: 1, not_measured: 2 });
    expect(v.limits.map((l) => [l.measurement, l.status])).toEqual([
      ['DC level', 'fail'], ['SFDR', 'not_measured'], ['SNR', 'not_measured'], ['Image rejection', 'pass'],
    ]);
    expect(v.limits[0]).toMatchObject({ margin: -9, note: 'req 4.2', unit: 'dBFS' });
    expect(v.limits[1].reason).toBe('window-limited');
    expect(v.limits[2].reason).toMatch(/measure-b/);
  });
  it('is incomplete, not pass, when nothing fails but a limit is not measured', () => {
    const v = judgeRun({ ...spec, limits: spec.limits.slice(0, 1) }, []);
    expect(v.overall).toBe('incomplete');
  });
});

describe('spec limits', () => {
  it('refuses unknown readouts, min above max, no limit and non-finite values, naming the field', () => {
    const bad = [
      [{ measurement: 'Wow factor', min: 1 }, 'measurement'],
      [{ measurement: 'SNR', min: 5, max: 1 }, 'min'],
      [{ measurement: 'SNR' }, 'min'],
      [{ measurement: 'SNR', max: Infinity }, 'max'],
    ] as const;
    for (const [limit, field] of bad) {
      const r = specLimitSchema.safeParse(limit);
      expect(r.success).toBe(false);
      expect(r.error!.issues[0].path).toEqual([field]);
    }
    const ok = newSpecSchema.parse({ name: ' Rev B ', limits: [{ measurement: 'Image rejection', min: 30 }] });
    expect(ok).toMatchObject({ name: 'Rev B', visibility: 'private', description: '' });
  });
});
