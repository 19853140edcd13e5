/**
 * Creating a chain: the chain row and its revision 1 in one transaction, so a chain never exists
 * without a document. Import and fork create chains the same way.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { prepareDocument } from './document';
import { insertRevision } from './revisions';
import type { ChainRevisionRow, ChainRow, Visibility } from './rows';

export interface NewChain {
  ownerId: string;
  name: string;
  description?: string;
  visibility: Visibility;
  /** The chain document as sent; validated here. */
  document: unknown;
  /** Message of revision 1. */
  message?: string;
  forkedFrom?: { chainId: string; revision: number };
}

/** Creates a chain with revision 1; 422 `invalid_chain` (nothing written) for a bad document. */
export async function createChain(db: Knex, input: NewChain): Promise<{ chain: ChainRow; revision: ChainRevisionRow }> {
  const stored = prepareDocument(input.document);
  return db.transaction(async (trx) => {
    const now = new Date().toISOString();
    const chain: ChainRow = {
      id: randomUUID(),
      owner_id: input.ownerId,
      name: input.name.trim(),
      description: (input.description ?? '').trim(),
      visibility: input.visibility,
      latest_revision: 1,
      forked_from_chain_id: input.forkedFrom?.chainId ?? null,
      forked_from_revision: input.forkedFrom?.revision ?? null,
      created_at: now,
      updated_at: now,
    };
    await trx('chains').insert(chain);
    const revision = await insertRevision(trx, chain.id, 1, input.ownerId, stored, input.message ?? '', now);
    return { chain, revision };
  });
}
