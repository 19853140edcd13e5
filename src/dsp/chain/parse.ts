/**
 * Validation of chain documents: the envelope, the version, unique stage ids, known kinds and every
 * stage's parameters against its kind's schema. All problems are collected, each naming the stage
 * (position, id, kind) and the field.
 */
import { z, type ZodIssue } from 'zod';
import type { ChainIssue, StageDefinition } from '../types';
import { stageDefinitions } from '../stages/index';
import { CHAIN_FORMAT_VERSION, documentHeaderSchema, stageEnvelopeSchema, type ChainDocument, type ChainStage } from './document';
import { ISSUE_CODES } from './issue-codes';
import { describeZodIssue, fieldPath, stageLabel } from './messages';

/** Result of `parseChainDocument`: the typed document (parameters completed with defaults) or the errors. */
export type ChainParseResult = { ok: true; document: ChainDocument } | { ok: false; issues: ChainIssue[] };

/** Thrown by `assertChainDocument` and by functions that need a valid document. */
export class ChainDocumentError extends Error {
  override name = 'ChainDocumentError';
  constructor(readonly issues: ChainIssue[]) {
    super(issues.length === 1 ? issues[0].message : `${issues.length} problems in the chain document:\n${issues.map((i) => `- ${i.message}`).join('\n')}`);
  }
}

function error(code: string, message: string, field?: string, stageId?: string): ChainIssue {
  const issue: ChainIssue = { severity: 'error', code, message };
  if (stageId !== undefined) issue.stageId = stageId;
  if (field !== undefined) issue.field = field;
  return issue;
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Issues of a zod failure, prefixed with `prefix` (a stage label or empty) and `fieldPrefix`. */
function zodIssues(issues: ZodIssue[], prefix: string, stageId: string | undefined, definition?: StageDefinition<any>): ChainIssue[] {
  const out: ChainIssue[] = [];
  const head = prefix ? `${prefix}: ` : '';
  for (const issue of issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        const field = fieldPath([...issue.path, key]);
        const known = definition ? ` (known: ${Object.keys(definition.fields).join(', ')})` : '';
        out.push(error(definition ? ISSUE_CODES.unknownParameter : ISSUE_CODES.invalidDocument, `${head}${field}: unknown ${definition ? 'parameter' : 'field'}${known}`, field, stageId));
      }
      continue;
    }
    const field = fieldPath(issue.path);
    const unit = definition?.fields[String(issue.path[0])]?.unit;
    const code = definition ? ISSUE_CODES.invalidParameter : ISSUE_CODES.invalidDocument;
    out.push(error(code, `${head}${field || 'document'}: ${describeZodIssue(issue, unit)}`, field || undefined, stageId));
  }
  return out;
}

/** Edit distance, for "did you mean" hints on misspelt kinds. */
function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diagonal = row[0];
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const above = row[j];
      row[j] = Math.min(row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] === b[j - 1] ? 0 : 1));
      diagonal = above;
    }
  }
  return row[b.length];
}

function unknownKindMessage(kind: string, registry: Record<string, StageDefinition<any>>): string {
  const known = Object.keys(registry);
  const closest = known.map((k) => ({ k, d: editDistance(kind, k) })).sort((x, y) => x.d - y.d)[0];
  const hint = closest && closest.d <= 2 ? `; did you mean "${closest.k}"?` : '';
  return `kind: unknown stage kind ${JSON.stringify(kind)} (known: ${known.join(', ')})${hint}`;
}

/**
 * Validate a chain document given as parsed JSON. Returns the typed document, every stage's
 * parameters completed with their defaults, or the list of errors (all of them, not only the first).
 */
export function parseChainDocument(json: unknown, registry: Record<string, StageDefinition<any>> = stageDefinitions): ChainParseResult {
  if (!isPlainObject(json)) {
    return { ok: false, issues: [error(ISSUE_CODES.invalidDocument, `document: must be a JSON object, got ${Array.isArray(json) ? 'an array' : json === null ? 'null' : typeof json}`)] };
  }
  const issues: ChainIssue[] = [];
  if (!('version' in json)) {
    issues.push(error(ISSUE_CODES.unsupportedVersion, `version: is required (this engine reads chain format version ${CHAIN_FORMAT_VERSION})`, 'version'));
  } else if (json.version !== CHAIN_FORMAT_VERSION) {
    issues.push(error(ISSUE_CODES.unsupportedVersion, `version: must be ${CHAIN_FORMAT_VERSION} (the chain format this engine reads), got ${JSON.stringify(json.version)}`, 'version'));
  }
  const header = documentHeaderSchema.safeParse(json);
  if (!header.success) issues.push(...zodIssues(header.error.issues, '', undefined));
  const rawStages = Array.isArray(json.stages) ? json.stages : [];

  const stages: ChainStage[] = [];
  const firstIndexOfId = new Map<string, number>();
  rawStages.forEach((raw, index) => {
    // Every problem of this stage carries its position: ids may be missing or repeated.
    const push = (...found: ChainIssue[]) => issues.push(...found.map((issue) => ({ ...issue, stageIndex: index })));
    const rawObject = isPlainObject(raw) ? raw : {};
    const label = stageLabel(index, rawObject.id, rawObject.kind);
    const stageId = typeof rawObject.id === 'string' ? rawObject.id : undefined;
    if (!isPlainObject(raw)) {
      push(error(ISSUE_CODES.invalidDocument, `${label}: must be an object with id, kind and params`, undefined, stageId));
      return;
    }
    const envelope = stageEnvelopeSchema.safeParse(raw);
    if (!envelope.success) {
      push(...zodIssues(envelope.error.issues, label, stageId).map((i) => (i.field === 'id' ? { ...i, code: ISSUE_CODES.invalidStageId } : i)));
    }
    if (stageId !== undefined) {
      const earlier = firstIndexOfId.get(stageId);
      if (earlier !== undefined) {
        push(error(ISSUE_CODES.duplicateStageId, `${label}: id: duplicate stage id ${JSON.stringify(stageId)} (already used by stages[${earlier}])`, 'id', stageId));
      } else {
        firstIndexOfId.set(stageId, index);
      }
    }
    if (typeof raw.kind !== 'string' || raw.kind === '') return;
    const definition = Object.prototype.hasOwnProperty.call(registry, raw.kind) ? registry[raw.kind] : undefined;
    if (!definition) {
      push(error(ISSUE_CODES.unknownStageKind, `${label}: ${unknownKindMessage(raw.kind, registry)}`, 'kind', stageId));
      return;
    }
    if (!envelope.success) return;
    const params = definition.schema.safeParse(envelope.data.params);
    if (!params.success) {
      push(...zodIssues(params.error.issues, label, stageId, definition));
      return;
    }
    stages.push({ ...envelope.data, params: params.data as Record<string, unknown> });
  });

  if (issues.length > 0 || !header.success) return { ok: false, issues };
  const document: ChainDocument = { version: CHAIN_FORMAT_VERSION, name: header.data.name, stages };
  if (header.data.description !== undefined) document.description = header.data.description;
  return { ok: true, document };
}

/** The validated document, or a ChainDocumentError listing every problem. */
export function assertChainDocument(json: unknown, registry: Record<string, StageDefinition<any>> = stageDefinitions): ChainDocument {
  const result = parseChainDocument(json, registry);
  if (!result.ok) throw new ChainDocumentError(result.issues);
  return result.document;
}

/**
 * The same validation as a zod schema, for request bodies: its output is the typed document and its
 * issues carry the messages above.
 */
export const chainDocumentSchema = z.unknown().transform((value, ctx): ChainDocument => {
  const result = parseChainDocument(value);
  if (result.ok) return result.document;
  for (const issue of result.issues) ctx.addIssue({ code: z.ZodIssueCode.custom, message: issue.message, params: { code: issue.code, stageId: issue.stageId, stageIndex: issue.stageIndex, field: issue.field } });
  return z.NEVER;
});
