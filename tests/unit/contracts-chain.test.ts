/**
 * The chain contract: a revision's document is validated once when saved and read back through one
 * reader that returns the branded type and refuses text changed since; a chain as the API presents
 * it has one shape for server and islands. Expected values are written out here.
 */
import { describe, expect, it } from 'vitest';
import {
  chainSchema, readStoredChainDocument, revisionSchema, storedChainDocumentOf, StoredChainDocumentError, type StoredChainDocument,
} from '@/contracts/chain';
import { prepareDocument } from '@/lib/server/chains/document';
import { presentChain, presentRevision } from '@/lib/server/chains/presenters';
import type { ChainWithOwner, RevisionWithAuthor } from '@/lib/server/chains/rows';
import { runBlocker } from '@/components/runs/run-check';

const source = { version: 1, name: 'Beacon', stages: [{ id: 'shift', kind: 'mix', params: { frequency: -250_000 } }] };

function refusal(json: string): StoredChainDocumentError {
  try {
    readStoredChainDocument(json);
  } catch (error) {
    if (error instanceof StoredChainDocumentError) return error;
    throw error;
  }
  throw new Error('the reader accepted tampered text');
}

describe('stored chain documents', () => {
  it('reads back what was saved, defaults filled in', () => {
    const saved = prepareDocument(source);
    const read: StoredChainDocument = readStoredChainDocument(saved.json);
    expect(read).toEqual({
      version: 1,
      name: 'Beacon',
      stages: [{ id: 'shift', kind: 'mix', params: { frequency: -250_000, phase: 0 }, probe: false, bypass: false }],
    });
    expect(read).toEqual(saved.document);
  });

  it('refuses tampered text, naming the field', () => {
    const saved = JSON.parse(prepareDocument(source).json);
    expect(refusal('{"version":1,"name":"x","stages":[').field).toBeNull();
    expect(refusal(JSON.stringify({ ...saved, version: 2 })).field).toBe('version');
    expect(refusal(JSON.stringify({ ...saved, stages: [{ ...saved.stages[0], id: '' }] })).field).toBe('stages[0].id');
    expect(refusal(JSON.stringify({ ...saved, stages: [{ ...saved.stages[0], kind: 7 }] })).field).toBe('stages[0].kind');
    expect(refusal(JSON.stringify({ ...saved, owner: 'someone' })).message).toMatch(/owner/);
  });

  it('a tampered revision is not presented as a document', () => {
    const row: RevisionWithAuthor = {
      id: 'r1', chain_id: 'c1', revision: 1, document: '{"version":1,"stages":"none"}', message: '', author_id: 'u1', author_name: 'Ada', hash: 'h', created_at: '2026-12-01T10:00:00.000Z',
    };
    expect(() => presentRevision(row)).toThrow(StoredChainDocumentError);
    const good = presentRevision({ ...row, document: prepareDocument(source).json });
    expect(revisionSchema.parse(good).document.stages[0]!.id).toBe('shift');
  });

  it('the run dialog reads an answered document through the contract: a tampered one is refused with its field, a good one checked against the capture', () => {
    const capture = { sampleRate: 1e6, layout: 'complex' as const, centerFrequency: null };
    expect(runBlocker(storedChainDocumentOf(JSON.parse(prepareDocument(source).json)), capture)).toBeNull();
    expect(() => storedChainDocumentOf({ version: 1, name: '', stages: [{ kind: 'mix' }] })).toThrow(/stages\[0\]\.id/);
  });
});

describe('chain as the API presents it', () => {
  const row: ChainWithOwner = {
    id: 'c1', owner_id: 'u1', owner_name: 'Ada', name: 'Beacon', description: '', visibility: 'private', latest_revision: 3,
    forked_from_chain_id: null, forked_from_revision: null, created_at: '2026-12-01T10:00:00.000Z', updated_at: '2026-12-02T10:00:00.000Z',
  };

  it('the presenter answers the contract: an absent description is empty text, not null', () => {
    const chain = chainSchema.parse(presentChain(row, null));
    expect(chain.description).toBe('');
    expect(chain.permissions).toEqual({ update: false, delete: false, fork: false, run: false });
  });

  it('refuses a null description, naming the field', () => {
    const result = chainSchema.safeParse({ ...presentChain(row, null), description: null });
    expect(result.success).toBe(false);
    if (!result.success) expect(result.error.issues.map((issue) => issue.path.join('.'))).toEqual(['description']);
  });
});
