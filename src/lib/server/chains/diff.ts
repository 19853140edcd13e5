/** The parameter-level difference between two revisions of one chain. */
import type { Knex } from 'knex';
import { diffChainDocuments, type ChainChange } from '@/lib/chain-diff';
import { readStoredChainDocument } from '@/contracts/chain';
import { getRevision } from './revisions';

/** Changes that turn revision `from` into revision `to` (404 when either is missing). */
export async function diffRevisions(db: Knex, chainId: string, from: number, to: number): Promise<ChainChange[]> {
  const [before, after] = await Promise.all([getRevision(db, chainId, from), getRevision(db, chainId, to)]);
  return diffChainDocuments(readStoredChainDocument(before.document), readStoredChainDocument(after.document));
}
