/**
 * Forking: a new private chain owned by the forker whose revision 1 is a copy of the chosen
 * revision of the original, remembering where it came from.
 */
import type { Knex } from 'knex';
import { readStoredChainDocument } from '@/contracts/chain';
import { createChain } from './create';
import { getRevision } from './revisions';
import type { ChainRevisionRow, ChainRow } from './rows';

/** Longest chain name (characters), as the chains table stores it. */
export const MAX_CHAIN_NAME = 200;

/** The default name of a fork: the original's name marked as a fork, within the length limit. */
export function forkName(original: string): string {
  const suffix = ' (fork)';
  return original.slice(0, MAX_CHAIN_NAME - suffix.length) + suffix;
}

export interface ForkRequest {
  forkerId: string;
  /** Revision to copy (default: the latest). */
  revision?: number;
  name?: string;
}

/** Forks `source` (already access-checked); 404 when the chosen revision does not exist. */
export async function forkChain(db: Knex, source: ChainRow, request: ForkRequest): Promise<{ chain: ChainRow; revision: ChainRevisionRow }> {
  const revisionNumber = request.revision ?? source.latest_revision;
  const original = await getRevision(db, source.id, revisionNumber);
  return createChain(db, {
    ownerId: request.forkerId,
    name: request.name ?? forkName(source.name),
    description: source.description,
    visibility: 'private',
    document: readStoredChainDocument(original.document),
    message: `Forked from "${source.name}" revision ${revisionNumber}`,
    forkedFrom: { chainId: source.id, revision: revisionNumber },
  });
}
