/**
 * Immutable numbered revisions: adding one (numbered in the same transaction that bumps the
 * chain's counter), listing, reading and restoring. Nothing here edits or deletes a revision.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { notFound } from '../api/errors';
import { readStoredChainDocument } from '@/contracts/chain';
import { prepareDocument, type StoredDocument } from './document';
import { findRevision, revisionsWithAuthor, type ChainRevisionRow, type RevisionWithAuthor } from './rows';

/** Longest revision message (characters). */
export const MAX_REVISION_MESSAGE = 500;

/**
 * Inserts revision `revision` of a chain inside `trx` (the caller numbers it and keeps the chain's
 * counter in step).
 */
export async function insertRevision(
  trx: Knex,
  chainId: string,
  revision: number,
  authorId: string,
  stored: StoredDocument,
  message: string,
  now: string,
): Promise<ChainRevisionRow> {
  const row: ChainRevisionRow = {
    id: randomUUID(),
    chain_id: chainId,
    revision,
    document: stored.json,
    message: message.slice(0, MAX_REVISION_MESSAGE),
    author_id: authorId,
    hash: stored.hash,
    created_at: now,
  };
  await trx('chain_revisions').insert(row);
  return row;
}

/**
 * Saves `document` as the chain's next revision and answers it. The counter is bumped by a write
 * before it is read, so the transaction holds the write lock from its first statement: two saves
 * at once are serialised and get consecutive numbers (the unique (chain_id, revision) index is the
 * last line of defence). 422 `invalid_chain` for a bad document, 404 when the chain is gone.
 */
export async function addRevision(db: Knex, chainId: string, authorId: string, document: unknown, message = ''): Promise<RevisionWithAuthor> {
  const stored = prepareDocument(document);
  const revision = await db.transaction(async (trx) => {
    const now = new Date().toISOString();
    const bumped = await trx('chains').where({ id: chainId }).update({ latest_revision: trx.raw('latest_revision + 1'), updated_at: now });
    if (bumped === 0) throw notFound('chain');
    const chain = await trx('chains').where({ id: chainId }).first('latest_revision');
    return insertRevision(trx, chainId, Number(chain.latest_revision), authorId, stored, message, now);
  });
  return (await findRevision(db, chainId, revision.revision))!;
}

/** Every revision of a chain without its document, newest first. */
export async function listRevisions(db: Knex, chainId: string): Promise<RevisionWithAuthor[]> {
  return (await revisionsWithAuthor(db, false).where('chain_revisions.chain_id', chainId).orderBy('chain_revisions.revision', 'desc')) as RevisionWithAuthor[];
}

/** Revision `revision` of a chain, or 404 `not_found` naming the revision. */
export async function getRevision(db: Knex, chainId: string, revision: number): Promise<RevisionWithAuthor> {
  const found = await findRevision(db, chainId, revision);
  if (!found) throw notFound(`revision ${revision} of this chain`);
  return found;
}

/** Makes a new revision whose document equals revision `revision`'s; the old one stays as it was. */
export async function restoreRevision(db: Knex, chainId: string, authorId: string, revision: number, message?: string): Promise<RevisionWithAuthor> {
  const old = await getRevision(db, chainId, revision);
  return addRevision(db, chainId, authorId, readStoredChainDocument(old.document), message || `Restored revision ${revision}`);
}
