/**
 * The notebook's forms and the chain document agree: every stage kind's defaults load into form
 * values that read back to the same parameters, a form edit produces the expected document, and
 * the form schema reports the engine's own problems.
 */
import { describe, expect, it } from 'vitest';
import { listStageKinds, getStageDefinition } from '@/dsp/stages/index';
import { parseChainDocument } from '@/dsp/chain/parse';
import { addStage, defaultParams, draftJson, emptyDocument, moveStage, duplicateStage, removeStage, setStageParams, toDraft } from '@/components/chains/draft';
import { hiddenFields, stageForm, switchVariant } from '@/components/chains/field-model';
import { formValuesToParams, paramsToFormValues } from '@/components/chains/form-values';
import { stageFormSchema } from '@/components/chains/form-schema';
import type { StreamFormat } from '@/dsp/types';

const input: StreamFormat = { sampleRate: 4e6, sampleType: 'complex' };

describe('every stage kind: defaults <-> form values', () => {
  it.each(listStageKinds().map((k) => k.kind))('%s', (kind) => {
    const definition = getStageDefinition(kind)!;
    const params = defaultParams(kind, input);
    // The defaults make a valid stage on their own.
    expect(definition.schema.safeParse(params).success).toBe(true);
    const { fields } = stageForm(definition, params);
    expect(fields.length).toBeGreaterThan(0);
    const values = paramsToFormValues(fields, params);
    for (const field of fields) {
      if (field.control === 'checkbox') expect(typeof values[field.name]).toBe('boolean');
      else if (field.control === 'choice-set') expect(Array.isArray(values[field.name])).toBe(true);
      else expect(typeof values[field.name]).toBe('string');
    }
    const back = formValuesToParams(fields, values, params);
    expect(back.errors).toEqual({});
    expect(back.params).toEqual(params);
    const checked = stageFormSchema(definition, fields, () => params).safeParse(values);
    expect(checked.success).toBe(true);
    if (checked.success) expect(checked.data).toEqual(params);
  });
});

describe('form values of known parameters', () => {
  it('writes frequencies with the prefix that reads best and counts as plain numbers', () => {
    const definition = getStageDefinition('filter')!;
    const params = { design: 'kaiser', response: 'lowpass', cutoff: 400_000, transition: 125_000, attenuation: 60 };
    const { fields, variant } = stageForm(definition, params);
    expect(variant).toEqual({ name: 'design', options: ['window', 'kaiser', 'taps', 'iir'], value: 'kaiser' });
    const values = paramsToFormValues(fields, params);
    expect(values).toMatchObject({ response: 'lowpass', cutoff: '400 kHz', transition: '125 kHz', attenuation: '60', ripple: '' });
  });

  it('reads a typed cut-off with an SI prefix into Hz in the document', () => {
    const { doc, id } = addStage(emptyDocument('t'), 'filter', input);
    const stage = doc.stages[0];
    const definition = getStageDefinition('filter')!;
    const { fields } = stageForm(definition, stage.params);
    const values = { ...paramsToFormValues(fields, stage.params), cutoff: '1.25M' };
    const reading = formValuesToParams(fields, values, stage.params);
    const edited = setStageParams(doc, id, reading.params);
    expect(JSON.parse(draftJson(edited))).toEqual({
      version: 1,
      name: 't',
      stages: [{ id: 'filter', kind: 'filter', probe: false, bypass: false, params: { design: 'window', response: 'lowpass', cutoff: 1_250_000, taps: 127, window: 'hamming', beta: 8.6 } }],
    });
    expect(parseChainDocument(edited).ok).toBe(true);
  });

  it('keeps the last good value in the document while the typed text is not a number', () => {
    const definition = getStageDefinition('mix')!;
    const params = { frequency: -600_000, phase: 0 };
    const { fields } = stageForm(definition, params);
    const reading = formValuesToParams(fields, { frequency: '-600 kQ', phase: '0' }, params);
    expect(reading.params.frequency).toBe(-600_000);
    expect(reading.errors.frequency).toMatch(/"kQ" is not a unit this field takes/);
  });

  it('reads pasted taps and names the entry that is not a number', () => {
    const definition = getStageDefinition('filter')!;
    const params = { design: 'taps', coefficients: [0.25, 0.5, 0.25] };
    const { fields } = stageForm(definition, params);
    expect(paramsToFormValues(fields, params).coefficients).toBe('0.25, 0.5, 0.25');
    expect(formValuesToParams(fields, { coefficients: '[0.1 0.2\n0.3, 1e-3]' }, params).params.coefficients).toEqual([0.1, 0.2, 0.3, 0.001]);
    expect(formValuesToParams(fields, { coefficients: '0.1, x2' }, params).errors.coefficients).toBe('entry 2 ("x2") is not a number');
  });

  it('reports the schema problem on its field, in the engine wording with the unit', () => {
    const definition = getStageDefinition('filter')!;
    const params = defaultParams('filter', input);
    const { fields } = stageForm(definition, params);
    const values = { ...paramsToFormValues(fields, params), cutoff: '-5 kHz' };
    const result = stageFormSchema(definition, fields, () => params).safeParse(values);
    expect(result.success).toBe(false);
    if (!result.success) expect(result.error.issues).toEqual([expect.objectContaining({ path: ['cutoff'], message: 'must be > 0 Hz' })]);
  });

  it('leaves an empty optional number out of the document', () => {
    const definition = getStageDefinition('filter')!;
    const params = { design: 'kaiser', response: 'lowpass', cutoff: 1e5, transition: 2e4, attenuation: 60, ripple: 0.1 };
    const { fields } = stageForm(definition, params);
    const reading = formValuesToParams(fields, { ...paramsToFormValues(fields, params), ripple: '' }, params);
    expect('ripple' in reading.params).toBe(false);
  });

  it('orders chosen measurements as the schema lists them', () => {
    const definition = getStageDefinition('measure')!;
    const params = defaultParams('measure', input);
    const { fields } = stageForm(definition, params);
    const reading = formValuesToParams(fields, { ...paramsToFormValues(fields, params), measurements: ['dc', 'tone'] }, params);
    expect(reading.params.measurements).toEqual(['tone', 'dc']);
  });
});

describe('defaults read off the incoming rate', () => {
  it('puts a new low-pass at an eighth of the rate and a new LO at a quarter', () => {
    expect(defaultParams('filter', { sampleRate: 4e6, sampleType: 'complex' }).cutoff).toBe(500_000);
    expect(defaultParams('filter', { sampleRate: 40e6, sampleType: 'real' }).cutoff).toBe(5e6);
    expect(defaultParams('quadrature-mix', { sampleRate: 40e6, sampleType: 'real' }).loFrequency).toBe(10e6);
  });

  it('decimates down to the band a preceding filter left', () => {
    expect(defaultParams('decimate', { sampleRate: 4e6, sampleType: 'complex', bandLimit: 250_000 }).factor).toBe(8);
    expect(defaultParams('decimate', { sampleRate: 4e6, sampleType: 'complex' }).factor).toBe(2);
  });
});

describe('variant switch and hidden fields', () => {
  it('keeps shared fields when the filter design changes and fills the new ones', () => {
    const definition = getStageDefinition('filter')!;
    const windowed = { design: 'window', response: 'lowpass', cutoff: 3e5, taps: 127, window: 'hamming', beta: 8.6 };
    const kaiser = switchVariant(definition, windowed, 'kaiser', { transition: 1e5 });
    expect(kaiser).toEqual({ design: 'kaiser', response: 'lowpass', cutoff: 3e5, attenuation: 60, transition: 1e5 });
    expect(definition.schema.safeParse(kaiser).success).toBe(true);
    const iir = switchVariant(definition, kaiser, 'iir');
    expect(iir).toEqual({ design: 'iir', family: 'butterworth', response: 'lowpass', cutoff: 3e5, order: 4, ripple: 1 });
  });

  it('hides fields that the other settings make meaningless', () => {
    expect([...hiddenFields('filter', { design: 'window', response: 'bandpass', window: 'hann' })].sort()).toEqual(['beta', 'cutoff']);
    expect([...hiddenFields('filter', { design: 'iir', response: 'lowpass', family: 'chebyshev1' })].sort()).toEqual(['high', 'low']);
    expect(hiddenFields('gain', { mode: 'fixed' }).has('targetDb')).toBe(true);
    expect(hiddenFields('measure', { measurements: ['channel-power'], window: 'kaiser' }).size).toBe(0);
  });
});

describe('document operations', () => {
  it('adds, duplicates, moves and removes stages with unique ids', () => {
    let doc = emptyDocument('ops');
    doc = addStage(doc, 'mix', input).doc;
    doc = addStage(doc, 'filter', input).doc;
    const copy = duplicateStage(doc, 'filter');
    expect(copy.id).toBe('filter-2');
    doc = moveStage(copy.doc, 'filter-2', 0);
    expect(doc.stages.map((s) => s.id)).toEqual(['filter-2', 'mix', 'filter']);
    doc = removeStage(doc, 'mix');
    expect(doc.stages.map((s) => s.id)).toEqual(['filter-2', 'filter']);
    expect(parseChainDocument(doc).ok).toBe(true);
  });

  it('loads a document from JSON keeping invalid values visible', () => {
    const draft = toDraft({ version: 1, name: 'x', stages: [{ id: 'a', kind: 'filter', params: { design: 'window', cutoff: 'abc' } }] });
    expect(draft?.stages[0]).toEqual({ id: 'a', kind: 'filter', params: { design: 'window', cutoff: 'abc' }, probe: false, bypass: false });
    expect(toDraft({ stages: 'no' })).toBeUndefined();
  });
});
