/** Chain document validation messages and the canonical form. */
import { describe, expect, it } from 'vitest';
import { canonicalChainJson, parseChainDocument, assertChainDocument, ChainDocumentError, chainDocumentSchema } from '@/dsp/chain/index';

const valid = {
  version: 1,
  name: 'Front-end balance check',
  stages: [
    { id: 'dc', kind: 'dc-remove', params: { method: 'mean' } },
    { id: 'iq', kind: 'iq-correct', params: {}, probe: true },
    { id: 'shift', kind: 'mix', params: { frequency: -600e3 } },
  ],
};

function messages(json: unknown): string[] {
  const result = parseChainDocument(json);
  if (result.ok) throw new Error('expected the document to be rejected');
  return result.issues.map((i) => i.message);
}

describe('parseChainDocument', () => {
  it('accepts a valid document and fills in defaults', () => {
    const result = parseChainDocument(valid);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const [dc, iq, shift] = result.document.stages;
    expect(dc).toEqual({ id: 'dc', kind: 'dc-remove', params: { method: 'mean', pole: 0.999, estimateSamples: 262_144 }, probe: false, bypass: false });
    expect(iq.probe).toBe(true);
    expect(shift.params).toEqual({ frequency: -600e3, phase: 0 });
    expect(result.document.name).toBe('Front-end balance check');
  });

  it('names an unknown stage kind and suggests the closest one', () => {
    const issues = parseChainDocument({ version: 1, stages: [{ id: 'a', kind: 'gain' }, { id: 'x', kind: 'mx', params: {} }] });
    expect(issues.ok).toBe(false);
    if (issues.ok) return;
    expect(issues.issues).toHaveLength(1);
    expect(issues.issues[0]).toMatchObject({ code: 'unknown-stage-kind', stageId: 'x', field: 'kind', severity: 'error' });
    expect(issues.issues[0].message).toMatch(/^stages\[1\] \(id "x", mx\): kind: unknown stage kind "mx" \(known: .*mix.*\); did you mean "mix"\?$/);
  });

  it('names the stage and field of a parameter out of range, with its unit', () => {
    const result = parseChainDocument({
      version: 1,
      stages: [
        { id: 'm', kind: 'mix', params: { phase: 400 } },
        { id: 'blk', kind: 'dc-remove', params: { method: 'blocker', pole: 0.5 } },
        { id: 't', kind: 'trim', params: { start: -2 } },
      ],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.issues.map((i) => i.message)).toEqual([
      'stages[0] (id "m", mix): phase: must be <= 360 deg',
      'stages[1] (id "blk", dc-remove): pole: must be >= 0.9',
      'stages[2] (id "t", trim): start: must be >= 0 s',
    ]);
    expect(result.issues.map((i) => [i.code, i.stageId, i.field])).toEqual([
      ['invalid-parameter', 'm', 'phase'],
      ['invalid-parameter', 'blk', 'pole'],
      ['invalid-parameter', 't', 'start'],
    ]);
  });

  it('words a filter parameter error as the chain format describes it, and catches a misspelt kind', () => {
    expect(
      messages({
        version: 1,
        stages: [
          { id: 'a', kind: 'mix' },
          { id: 'b', kind: 'gain' },
          { id: 'lp', kind: 'filter', params: { design: 'window', cutoff: -5 } },
          { id: 'lp2', kind: 'fliter' },
        ],
      }),
    ).toEqual([
      'stages[2] (id "lp", filter): cutoff: must be > 0 Hz',
      expect.stringMatching(/^stages\[3\] \(id "lp2", fliter\): kind: unknown stage kind "fliter" \(known: .*\); did you mean "filter"\?$/),
    ]);
  });

  it('reports a duplicate stage id with the stage that used it first', () => {
    const result = parseChainDocument({ version: 1, stages: [{ id: 'a', kind: 'gain' }, { id: 'b', kind: 'trim' }, { id: 'a', kind: 'mix' }] });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.issues).toEqual([
      { severity: 'error', code: 'duplicate-stage-id', stageId: 'a', stageIndex: 2, field: 'id', message: 'stages[2] (id "a", mix): id: duplicate stage id "a" (already used by stages[0])' },
    ]);
  });

  it('reports unknown parameters, wrong types and bad choices by field', () => {
    expect(
      messages({
        version: 1,
        stages: [
          { id: 'g', kind: 'gain', params: { gain: 3 } },
          { id: 'q', kind: 'quadrature-mix', params: { loFrequency: '10 MHz', convention: 'upright' } },
          { id: 'i', kind: 'dc-remove', params: { estimateSamples: 10.5 } },
        ],
      }),
    ).toEqual([
      'stages[0] (id "g", gain): gain: unknown parameter (known: mode, gainDb, targetDb, estimateSamples)',
      'stages[1] (id "q", quadrature-mix): loFrequency: must be a number, got string',
      `stages[1] (id "q", quadrature-mix): convention: must be one of 'i-minus-jq', 'i-plus-jq', got "upright"`,
      'stages[2] (id "i", dc-remove): estimateSamples: must be an integer, got a fraction',
    ]);
  });

  it('rejects a bad version, a missing stage list, bad ids and bad flags', () => {
    expect(messages({ version: 2, stages: [] })).toEqual(['version: must be 1 (the chain format this engine reads), got 2']);
    expect(messages({ stages: [] })[0]).toBe('version: is required (this engine reads chain format version 1)');
    expect(messages({ version: 1 })).toEqual(['stages: is required']);
    expect(messages([])).toEqual(['document: must be a JSON object, got an array']);
    expect(messages({ version: 1, stages: [{ id: 'has space', kind: 'gain' }] })[0]).toBe(
      'stages[0] (id "has space", gain): id: must be 1 to 64 letters, digits, "-", "_" or ".", starting with a letter or digit',
    );
    expect(messages({ version: 1, stages: [{ kind: 'gain' }] })[0]).toBe('stages[0] (no id, gain): id: is required');
    expect(messages({ version: 1, stages: [{ id: 'g', kind: 'gain', probe: 'yes' }] })[0]).toBe('stages[0] (id "g", gain): probe: must be a boolean, got string');
    expect(messages({ version: 1, stages: [{ id: 'g', kind: 'gain', colour: 'red' }] })[0]).toBe('stages[0] (id "g", gain): colour: unknown field');
    expect(messages({ version: 1, stages: [], extra: 1 })[0]).toBe('extra: unknown field');
  });

  it('collects every problem, not only the first', () => {
    const result = parseChainDocument({ version: 1, stages: [{ id: 'a', kind: 'nope' }, { id: 'b', kind: 'gain', params: { gainDb: 1000 } }, { id: 'a', kind: 'trim' }] });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.issues.map((i) => i.code)).toEqual(['unknown-stage-kind', 'invalid-parameter', 'duplicate-stage-id']);
  });

  it('assertChainDocument throws one error listing every problem; the zod schema carries the same messages', () => {
    const bad = { version: 1, stages: [{ id: 'm', kind: 'mix', params: { phase: 400 } }] };
    expect(() => assertChainDocument(bad)).toThrow(ChainDocumentError);
    expect(() => assertChainDocument(bad)).toThrow('stages[0] (id "m", mix): phase: must be <= 360 deg');
    const viaSchema = chainDocumentSchema.safeParse(bad);
    expect(viaSchema.success).toBe(false);
    if (!viaSchema.success) expect(viaSchema.error.issues[0].message).toBe('stages[0] (id "m", mix): phase: must be <= 360 deg');
    expect(chainDocumentSchema.parse(valid).stages).toHaveLength(3);
  });
});

describe('canonicalChainJson', () => {
  it('is the same for documents that differ only in key order and omitted defaults', () => {
    const a = { version: 1, name: 'x', stages: [{ id: 's1', kind: 'mix', params: { frequency: -1.25e6 } }] };
    const b = { stages: [{ bypass: false, params: { phase: 0, frequency: -1250000 }, probe: false, kind: 'mix', id: 's1' }], name: 'x', version: 1 };
    expect(canonicalChainJson(a)).toBe(canonicalChainJson(b));
    expect(canonicalChainJson(a)).toBe('{"version":1,"name":"x","stages":[{"id":"s1","kind":"mix","params":{"frequency":-1250000,"phase":0},"probe":false,"bypass":false}]}');
  });

  it('changes with any parameter, and ignores the name in the computation-only form', () => {
    const a = { version: 1, name: 'x', stages: [{ id: 's1', kind: 'gain', params: { gainDb: 1 } }] };
    const b = { ...a, stages: [{ id: 's1', kind: 'gain', params: { gainDb: 1.5 } }] };
    expect(canonicalChainJson(a)).not.toBe(canonicalChainJson(b));
    const renamed = { ...a, name: 'y', description: 'renamed' };
    expect(canonicalChainJson(a)).not.toBe(canonicalChainJson(renamed));
    expect(canonicalChainJson(a, { computationOnly: true })).toBe(canonicalChainJson(renamed, { computationOnly: true }));
  });

  it('refuses an invalid document', () => {
    expect(() => canonicalChainJson({ version: 1, stages: [{ id: 'a', kind: 'nope' }] })).toThrow(/unknown stage kind "nope"/);
  });
});
