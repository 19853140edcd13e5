/**
 * The notebook's document state: a chain document as the JSON view and the API see it, possibly
 * invalid while someone edits it (a cut-off not typed yet). Pure operations return a new document;
 * the validation of record is parseChainDocument, run on every change.
 */
import { CHAIN_FORMAT_VERSION, STAGE_ID_PATTERN, type ChainDocument, type ChainStage } from '@/contracts/chain';
import type { StreamFormat } from '@/dsp/types';
import { getStageDefinition } from '@/dsp/stages/index';

/** One stage as the editor holds it: the contract's stage, its parameters not yet checked against the kind's schema. */
export type DraftStage = ChainStage;

/** A chain document under edit: the contract's shape, possibly invalid until parseChainDocument says otherwise. */
export type DraftDocument = ChainDocument;

/** An empty chain document. */
export function emptyDocument(name = ''): DraftDocument {
  return { version: CHAIN_FORMAT_VERSION, name, stages: [] };
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * A draft from any JSON value whose outline is a chain document (object with a stages array of
 * objects); undefined otherwise. Values are kept as given, so an invalid parameter stays visible.
 */
export function toDraft(json: unknown): DraftDocument | undefined {
  if (!isPlainObject(json) || !Array.isArray(json.stages)) return undefined;
  if (!json.stages.every(isPlainObject)) return undefined;
  const stages = (json.stages as Record<string, unknown>[]).map((s) => ({
    id: typeof s.id === 'string' ? s.id : '',
    kind: typeof s.kind === 'string' ? s.kind : '',
    params: isPlainObject(s.params) ? { ...s.params } : {},
    probe: s.probe === true,
    bypass: s.bypass === true,
  }));
  const draft: DraftDocument = { version: CHAIN_FORMAT_VERSION, name: typeof json.name === 'string' ? json.name : '', stages };
  if (typeof json.description === 'string') draft.description = json.description;
  return draft;
}

/** A stage id not yet used in the document, from the kind (`filter`, `filter-2`, ...). */
export function newStageId(doc: DraftDocument, kind: string): string {
  const used = new Set(doc.stages.map((s) => s.id));
  const base = kind.replace(/[^A-Za-z0-9_.-]/g, '-').slice(0, 56) || 'stage';
  if (!used.has(base) && STAGE_ID_PATTERN.test(base)) return base;
  for (let n = 2; ; n++) {
    const id = `${base}-${n}`;
    if (!used.has(id)) return id;
  }
}

/** A round number near `value` (1, 2 or 5 times a power of ten), for defaults read off a rate. */
export function roundNumber(value: number): number {
  if (!(value > 0) || !Number.isFinite(value)) return value;
  const power = 10 ** Math.floor(Math.log10(value));
  const mantissa = value / power;
  const step = mantissa < 1.5 ? 1 : mantissa < 3.5 ? 2 : mantissa < 7.5 ? 5 : 10;
  return step * power;
}

/**
 * Parameters of a new stage of `kind` fed `input`: the schema's defaults, with the values that only
 * make sense relative to the incoming rate read off it (a low-pass at an eighth of the rate, an LO
 * at a quarter, a decimation that keeps the band a preceding filter left).
 */
export function defaultParams(kind: string, input: StreamFormat | undefined): Record<string, unknown> {
  const definition = getStageDefinition(kind);
  if (!definition) return {};
  const rate = input?.sampleRate;
  const seed: Record<string, unknown> = {};
  if (kind === 'filter') {
    seed.design = 'window';
    seed.response = 'lowpass';
    seed.cutoff = rate ? roundNumber(rate / 8) : 1000;
  } else if (kind === 'quadrature-mix' && rate) {
    seed.loFrequency = roundNumber(rate / 4);
  } else if (kind === 'decimate' && rate && input?.bandLimit) {
    seed.factor = Math.max(2, Math.min(4096, Math.floor(rate / (2 * input.bandLimit))));
  }
  const parsed = definition.schema.safeParse(seed);
  return parsed.success ? (parsed.data as Record<string, unknown>) : seed;
}

/** The document with a new stage of `kind` inserted at `index` (end when absent). */
export function addStage(doc: DraftDocument, kind: string, input: StreamFormat | undefined, index = doc.stages.length): { doc: DraftDocument; id: string } {
  const id = newStageId(doc, kind);
  const stage: DraftStage = { id, kind, params: defaultParams(kind, input), probe: false, bypass: false };
  const stages = doc.stages.slice();
  stages.splice(Math.max(0, Math.min(index, stages.length)), 0, stage);
  return { doc: { ...doc, stages }, id };
}

/** The document without stage `id`. */
export function removeStage(doc: DraftDocument, id: string): DraftDocument {
  return { ...doc, stages: doc.stages.filter((s) => s.id !== id) };
}

/** The document with a copy of stage `id` right after it (new id, same parameters). */
export function duplicateStage(doc: DraftDocument, id: string): { doc: DraftDocument; id: string } {
  const index = doc.stages.findIndex((s) => s.id === id);
  if (index < 0) return { doc, id };
  const original = doc.stages[index];
  const copyId = newStageId(doc, original.kind);
  const stages = doc.stages.slice();
  stages.splice(index + 1, 0, { ...original, id: copyId, params: structuredClone(original.params) });
  return { doc: { ...doc, stages }, id: copyId };
}

/** The document with stage `id` moved to position `to` (clamped). */
export function moveStage(doc: DraftDocument, id: string, to: number): DraftDocument {
  const from = doc.stages.findIndex((s) => s.id === id);
  if (from < 0) return doc;
  const target = Math.max(0, Math.min(to, doc.stages.length - 1));
  if (target === from) return doc;
  const stages = doc.stages.slice();
  const [stage] = stages.splice(from, 1);
  stages.splice(target, 0, stage);
  return { ...doc, stages };
}

/** The document with one stage replaced by `update(stage)`. */
export function updateStage(doc: DraftDocument, id: string, update: (stage: DraftStage) => DraftStage): DraftDocument {
  return { ...doc, stages: doc.stages.map((s) => (s.id === id ? update(s) : s)) };
}

/** The document with stage `id`'s parameters set to `params`. */
export function setStageParams(doc: DraftDocument, id: string, params: Record<string, unknown>): DraftDocument {
  return updateStage(doc, id, (s) => ({ ...s, params }));
}

/** The JSON text of a draft as the JSON view shows it and the export writes it. */
export function draftJson(doc: DraftDocument): string {
  return JSON.stringify(doc, null, 2) + '\n';
}
