import { describe, expect, it } from 'vitest';
import { diffChainDocuments, sameJsonValue, type DiffableChain, type DiffableStage } from '@/lib/chain-diff';

const mix: DiffableStage = { id: 'nco', kind: 'mix', params: { frequency: -600_000, phase: 0 }, probe: false, bypass: false };
const lowpass: DiffableStage = {
  id: 'lp',
  kind: 'filter',
  params: { design: 'window', response: 'lowpass', cutoff: 200_000, taps: 127, window: 'hamming' },
  probe: false,
  bypass: false,
};
const decimate: DiffableStage = { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false }, probe: false, bypass: false };
const psd: DiffableStage = { id: 'psd', kind: 'spectrum', params: { fftSize: 4096 }, probe: true, bypass: false };

function chain(...stages: DiffableStage[]): DiffableChain {
  return { name: 'Beacon', stages };
}

describe('diffChainDocuments', () => {
  it('reports nothing for equal documents', () => {
    expect(diffChainDocuments(chain(mix, lowpass, decimate, psd), chain(mix, lowpass, decimate, psd))).toEqual([]);
  });

  it('names a changed parameter with its path and both values', () => {
    const edited = { ...lowpass, params: { ...lowpass.params, cutoff: 180_000 } };
    expect(diffChainDocuments(chain(mix, lowpass), chain(mix, edited))).toEqual([
      { stageId: 'lp', kind: 'filter', change: 'changed', field: 'params.cutoff', before: 200_000, after: 180_000 },
    ]);
  });

  it('reports a parameter that appears or disappears with only the side it exists on', () => {
    const withBeta = { ...lowpass, params: { ...lowpass.params, beta: 8.6 } };
    const withoutTaps = { ...lowpass, params: { design: 'window', response: 'lowpass', cutoff: 200_000, window: 'hamming' } };
    expect(diffChainDocuments(chain(lowpass), chain(withBeta))).toEqual([
      { stageId: 'lp', kind: 'filter', change: 'changed', field: 'params.beta', after: 8.6 },
    ]);
    expect(diffChainDocuments(chain(lowpass), chain(withoutTaps))).toEqual([
      { stageId: 'lp', kind: 'filter', change: 'changed', field: 'params.taps', before: 127 },
    ]);
  });

  it('walks nested objects but compares arrays as one value', () => {
    const before: DiffableStage = { id: 'm', kind: 'measure', params: { measurements: ['tone', 'snr'], band: { low: -1, high: 1 } } };
    const after: DiffableStage = { id: 'm', kind: 'measure', params: { measurements: ['tone', 'snr', 'dc'], band: { low: -1, high: 2 } } };
    expect(diffChainDocuments(chain(before), chain(after))).toEqual([
      { stageId: 'm', kind: 'measure', change: 'changed', field: 'params.band.high', before: 1, after: 2 },
      { stageId: 'm', kind: 'measure', change: 'changed', field: 'params.measurements', before: ['tone', 'snr'], after: ['tone', 'snr', 'dc'] },
    ]);
  });

  it('reports probe, bypass and kind changes as fields of the stage', () => {
    const bypassed = { ...decimate, bypass: true, probe: true };
    expect(diffChainDocuments(chain(decimate), chain(bypassed))).toEqual([
      { stageId: 'dec', kind: 'decimate', change: 'changed', field: 'probe', before: false, after: true },
      { stageId: 'dec', kind: 'decimate', change: 'changed', field: 'bypass', before: false, after: true },
    ]);
    const rekinded: DiffableStage = { id: 'dec', kind: 'gain', params: { gainDb: 6 } };
    const changes = diffChainDocuments(chain(decimate), chain(rekinded));
    expect(changes[0]).toEqual({ stageId: 'dec', kind: 'gain', change: 'changed', field: 'kind', before: 'decimate', after: 'gain' });
    expect(changes.map((c) => c.field)).toEqual(['kind', 'params.antiAlias', 'params.factor', 'params.gainDb']);
  });

  it('matches stages by id: an insertion at the top is one addition, not a shift of everything', () => {
    const dc: DiffableStage = { id: 'dc', kind: 'dc-remove', params: { method: 'mean' } };
    expect(diffChainDocuments(chain(mix, lowpass, decimate), chain(dc, mix, lowpass, decimate))).toEqual([
      { stageId: 'dc', kind: 'dc-remove', change: 'added', after: 0 },
    ]);
    expect(diffChainDocuments(chain(dc, mix, lowpass, decimate), chain(mix, lowpass, decimate))).toEqual([
      { stageId: 'dc', kind: 'dc-remove', change: 'removed', before: 0 },
    ]);
  });

  it('reports only the stage that left its place as moved', () => {
    // psd dragged from last to first: the other three keep their relative order.
    expect(diffChainDocuments(chain(mix, lowpass, decimate, psd), chain(psd, mix, lowpass, decimate))).toEqual([
      { stageId: 'psd', kind: 'spectrum', change: 'moved', before: 3, after: 0 },
    ]);
  });

  it('reports a moved stage that also changed once as moved and once per changed field', () => {
    const edited = { ...mix, params: { frequency: -601_800, phase: 0 } };
    const changes = diffChainDocuments(chain(mix, lowpass, decimate), chain(lowpass, decimate, edited));
    expect(changes).toEqual([
      { stageId: 'nco', kind: 'mix', change: 'moved', before: 0, after: 2 },
      { stageId: 'nco', kind: 'mix', change: 'changed', field: 'params.frequency', before: -600_000, after: -601_800 },
    ]);
  });

  it('reports the document name and description as fields without a stage', () => {
    const renamed: DiffableChain = { name: 'Beacon v2', description: 'new notes', stages: [mix] };
    expect(diffChainDocuments(chain(mix), renamed)).toEqual([
      { stageId: null, kind: null, change: 'changed', field: 'name', before: 'Beacon', after: 'Beacon v2' },
      { stageId: null, kind: null, change: 'changed', field: 'description', after: 'new notes' },
    ]);
  });

  it('combines removals, additions and changes in one report', () => {
    const gain: DiffableStage = { id: 'g', kind: 'gain', params: { gainDb: 6 } };
    const edited = { ...decimate, params: { factor: 4, antiAlias: false } };
    const changes = diffChainDocuments(chain(mix, lowpass, decimate, psd), chain(mix, gain, edited, psd));
    expect(changes).toEqual([
      { stageId: 'lp', kind: 'filter', change: 'removed', before: 1 },
      { stageId: 'g', kind: 'gain', change: 'added', after: 1 },
      { stageId: 'dec', kind: 'decimate', change: 'changed', field: 'params.factor', before: 8, after: 4 },
    ]);
  });
});

describe('sameJsonValue', () => {
  it('compares as JSON text would', () => {
    expect(sameJsonValue({ a: [1, { b: 2 }] }, { a: [1, { b: 2 }] })).toBe(true);
    expect(sameJsonValue({ a: 1, b: undefined }, { a: 1 })).toBe(true);
    expect(sameJsonValue(-0, 0)).toBe(true);
    expect(sameJsonValue([1, 2], [2, 1])).toBe(false);
    expect(sameJsonValue({ a: 1 }, [1])).toBe(false);
    expect(sameJsonValue('1', 1)).toBe(false);
  });
});
