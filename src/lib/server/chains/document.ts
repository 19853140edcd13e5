/**
 * Chain documents on their way into the database: validated by the engine's parser, stored in
 * canonical form (every default filled in, keys in a fixed order) and identified by a SHA-256 of
 * that text. Storing the completed document keeps a revision's meaning fixed even if a later
 * engine changes a default.
 */
import { createHash } from 'node:crypto';
import { canonicalChain, ISSUE_CODES, parseChainDocument } from '@/dsp/chain';
import type { ChainIssue } from '@/dsp/types';
import { storedChainDocumentSchema, type StoredChainDocument } from '@/contracts/chain';
import { unprocessable, type ApiError } from '../api/errors';

/** A document ready to store: its canonical JSON text and that text's SHA-256 (hex). */
export interface StoredDocument {
  document: StoredChainDocument;
  json: string;
  hash: string;
}

const parameterCodes: ReadonlySet<string> = new Set([ISSUE_CODES.invalidParameter, ISSUE_CODES.unknownParameter]);

/**
 * The request field an engine issue is about, from the body's root: `document.stages[2].params.cutoff`,
 * `document.stages[0].kind`, `document.version`. The issue's `stageIndex` is the one reliable
 * index (ids may be missing or duplicated).
 */
export function issueField(issue: ChainIssue, root = 'document'): string {
  if (issue.stageIndex === undefined) return issue.field ? `${root}.${issue.field}` : root;
  const base = `${root}.stages[${issue.stageIndex}]`;
  if (parameterCodes.has(issue.code)) return issue.field ? `${base}.params.${issue.field}` : `${base}.params`;
  return issue.field ? `${base}.${issue.field}` : base;
}

/** 422 `invalid_chain` for the first problem, naming the field; the count of the others follows. */
export function invalidChain(issues: ChainIssue[], root = 'document'): ApiError {
  const first = issues[0]!;
  const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
  const facts = { ...(first.stageIndex !== undefined ? { stageIndex: first.stageIndex } : {}), ...(first.stageId !== undefined ? { stageId: first.stageId } : {}) };
  return unprocessable('invalid_chain', `${first.message}${more}`, issueField(first, root), facts);
}

/**
 * Validates a chain document from a request body (422 `invalid_chain` naming the field) and
 * prepares it for storage: the one place a document becomes a StoredChainDocument. Read it back
 * with readStoredChainDocument (src/contracts/chain.ts).
 */
export function prepareDocument(value: unknown, root = 'document'): StoredDocument {
  const parsed = parseChainDocument(value);
  if (!parsed.ok) throw invalidChain(parsed.issues, root);
  const canonical = canonicalChain(parsed.document);
  const json = JSON.stringify(canonical);
  return { document: storedChainDocumentSchema.parse(canonical), json, hash: createHash('sha256').update(json).digest('hex') };
}
