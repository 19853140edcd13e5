/**
 * Canonical form of a chain document: every parameter default filled in and every object's keys in
 * a fixed order, so two documents that mean the same chain serialise to the same string. The
 * server hashes that string to identify a chain revision (no hashing here: this folder stays free
 * of platform crypto).
 */
import type { StageDefinition } from '../types';
import { stageDefinitions } from '../stages/index';
import type { ChainDocument } from './document';
import { assertChainDocument } from './parse';

export interface CanonicalOptions {
  /**
   * Leave out what cannot change a run's results (name, description), so renaming a chain keeps
   * the same identity for result caching.
   */
  computationOnly?: boolean;
  registry?: Record<string, StageDefinition<any>>;
}

/** Deep copy with object keys sorted (arrays keep their order); -0 becomes 0. */
function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (typeof value === 'object' && value !== null) {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value).sort()) {
      const v = (value as Record<string, unknown>)[key];
      if (v !== undefined) out[key] = sortKeys(v);
    }
    return out;
  }
  if (typeof value === 'number' && Object.is(value, -0)) return 0;
  return value;
}

/**
 * The canonical object of a chain document (validated first: throws ChainDocumentError when it is
 * invalid). Key order: version, name, description, stages; per stage id, kind, params (sorted),
 * probe, bypass.
 */
export function canonicalChain(doc: ChainDocument | unknown, options: CanonicalOptions = {}): Record<string, unknown> {
  const valid = assertChainDocument(doc, options.registry ?? stageDefinitions);
  const out: Record<string, unknown> = { version: valid.version };
  if (!options.computationOnly) {
    out.name = valid.name;
    if (valid.description !== undefined) out.description = valid.description;
  }
  out.stages = valid.stages.map((stage) => ({
    id: stage.id,
    kind: stage.kind,
    params: sortKeys(stage.params),
    probe: stage.probe,
    bypass: stage.bypass,
  }));
  return out;
}

/** The canonical JSON text of a chain document (no whitespace); equal texts mean equal chains. */
export function canonicalChainJson(doc: ChainDocument | unknown, options: CanonicalOptions = {}): string {
  return JSON.stringify(canonicalChain(doc, options));
}
