/**
 * Parameter-level difference between two chain documents, shared by the server (revision diff
 * endpoint) and the notebook (unsaved edits against the last revision). Pure: it imports types only.
 *
 * Stages are matched by their stable id, never by position, so inserting a stage at the top
 * reports one addition rather than every later stage as changed. Among the stages both documents
 * hold, the longest run that kept its relative order counts as staying put; the others are
 * reported as moved. Parameters are compared field by field through nested objects; an array
 * (pasted taps, a list of measurements) is compared as one value, since a per-element report of a
 * 127-tap filter would bury the change.
 */
import type { ChainDocument, ChainStage } from '@/contracts/chain';

/** What happened to a stage (or, for document-level fields, `changed`). */
export type ChainChangeKind = 'added' | 'removed' | 'moved' | 'changed';

/** One difference. */
export interface ChainChange {
  /** The stage's id; null for a field of the document itself (`name`, `description`). */
  stageId: string | null;
  /** The stage kind (after the change when it changed); null for a document field. */
  kind: string | null;
  change: ChainChangeKind;
  /**
   * For `changed`: the field's path from the stage (`params.cutoff`, `params.band.low`, `probe`,
   * `bypass`, `kind`) or from the document (`name`, `description`).
   */
  field?: string;
  /** `changed`: the old value (absent when the field was absent). `moved`/`removed`: old position (0-based). */
  before?: unknown;
  /** `changed`: the new value (absent when the field was removed). `moved`/`added`: new position (0-based). */
  after?: unknown;
}

/** The parts of a stage the diff reads: the contract's ChainStage, flags and parameters optional. */
export type DiffableStage = Pick<ChainStage, 'id' | 'kind'> & Partial<Pick<ChainStage, 'params' | 'probe' | 'bypass'>>;

/** The parts of a chain document the diff reads: the contract's ChainDocument, name optional. */
export type DiffableChain = Partial<Pick<ChainDocument, 'name' | 'description'>> & { stages: readonly DiffableStage[] };

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Deep equality of JSON values; -0 equals 0 as it does in JSON text. */
export function sameJsonValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a) || Array.isArray(b)) {
    if (!Array.isArray(a) || !Array.isArray(b) || a.length !== b.length) return false;
    return a.every((item, index) => sameJsonValue(item, b[index]));
  }
  if (isPlainObject(a) && isPlainObject(b)) {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const key of keys) if (!sameJsonValue(a[key], b[key])) return false;
    return true;
  }
  return Number.isNaN(a) && Number.isNaN(b);
}

/** Field-level changes between two values, recursing through plain objects only. */
function fieldChanges(before: unknown, after: unknown, path: string, out: Array<{ field: string; before?: unknown; after?: unknown }>): void {
  if (sameJsonValue(before, after)) return;
  if (isPlainObject(before) && isPlainObject(after)) {
    const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])].sort();
    for (const key of keys) fieldChanges(before[key], after[key], `${path}.${key}`, out);
    return;
  }
  const entry: { field: string; before?: unknown; after?: unknown } = { field: path };
  if (before !== undefined) entry.before = before;
  if (after !== undefined) entry.after = after;
  out.push(entry);
}

/** Ids of the longest common subsequence of two id lists (the stages that kept their order). */
function stayingPut(from: string[], to: string[]): Set<string> {
  const rows = from.length;
  const cols = to.length;
  // lengths[i][j]: LCS length of from[i..] and to[j..].
  const lengths = Array.from({ length: rows + 1 }, () => new Array<number>(cols + 1).fill(0));
  for (let i = rows - 1; i >= 0; i--) {
    for (let j = cols - 1; j >= 0; j--) {
      lengths[i]![j] = from[i] === to[j] ? lengths[i + 1]![j + 1]! + 1 : Math.max(lengths[i + 1]![j]!, lengths[i]![j + 1]!);
    }
  }
  const kept = new Set<string>();
  let i = 0;
  let j = 0;
  while (i < rows && j < cols) {
    if (from[i] === to[j]) {
      kept.add(from[i]!);
      i++;
      j++;
    } else if (lengths[i + 1]![j]! >= lengths[i]![j + 1]!) {
      i++;
    } else {
      j++;
    }
  }
  return kept;
}

/**
 * The changes that turn chain document `from` into `to`: document fields first, then removed
 * stages in their old order, then added, moved and changed stages in their new order.
 */
export function diffChainDocuments(from: DiffableChain, to: DiffableChain): ChainChange[] {
  const changes: ChainChange[] = [];
  for (const field of ['name', 'description'] as const) {
    const before = from[field];
    const after = to[field];
    if (before === after) continue;
    const change: ChainChange = { stageId: null, kind: null, change: 'changed', field };
    if (before !== undefined) change.before = before;
    if (after !== undefined) change.after = after;
    changes.push(change);
  }

  const oldIndex = new Map(from.stages.map((stage, index) => [stage.id, index]));
  const newIds = new Set(to.stages.map((stage) => stage.id));
  from.stages.forEach((stage, index) => {
    if (!newIds.has(stage.id)) changes.push({ stageId: stage.id, kind: stage.kind, change: 'removed', before: index });
  });

  const common = (stages: readonly DiffableStage[], others: Map<string, number> | Set<string>) =>
    stages.map((stage) => stage.id).filter((id) => others.has(id));
  const kept = stayingPut(common(from.stages, newIds), common(to.stages, oldIndex));

  to.stages.forEach((stage, index) => {
    const previousIndex = oldIndex.get(stage.id);
    if (previousIndex === undefined) {
      changes.push({ stageId: stage.id, kind: stage.kind, change: 'added', after: index });
      return;
    }
    if (!kept.has(stage.id)) changes.push({ stageId: stage.id, kind: stage.kind, change: 'moved', before: previousIndex, after: index });
    const previous = from.stages[previousIndex]!;
    const fields: Array<{ field: string; before?: unknown; after?: unknown }> = [];
    fieldChanges(previous.kind, stage.kind, 'kind', fields);
    fieldChanges(previous.params ?? {}, stage.params ?? {}, 'params', fields);
    fieldChanges(previous.probe ?? false, stage.probe ?? false, 'probe', fields);
    fieldChanges(previous.bypass ?? false, stage.bypass ?? false, 'bypass', fields);
    for (const field of fields) changes.push({ stageId: stage.id, kind: stage.kind, change: 'changed', ...field });
  });
  return changes;
}
