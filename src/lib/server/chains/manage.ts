/**
 * Changing a chain's own fields (name, description, visibility) and deleting a chain with its
 * revisions. The documents are never touched here: those change only by new revisions.
 */
import type { Knex } from 'knex';
import { notFound } from '../api/errors';
import type { ChainChanges } from '@/contracts/chain';
import { findChain, type ChainWithOwner } from './rows';

export type { ChainChanges };

/** Applies the changes and answers the updated chain; 404 when it is gone. */
export async function updateChain(db: Knex, id: string, changes: ChainChanges): Promise<ChainWithOwner> {
  const update: Record<string, string> = { updated_at: new Date().toISOString() };
  if (changes.name !== undefined) update.name = changes.name.trim();
  if (changes.description !== undefined) update.description = changes.description.trim();
  if (changes.visibility !== undefined) update.visibility = changes.visibility;
  const updated = await db('chains').where({ id }).update(update);
  if (updated === 0) throw notFound('chain');
  return (await findChain(db, id))!;
}

/** Deletes a chain and (by the foreign key's cascade) its revisions; forks of it keep their origin ids. */
export async function deleteChain(db: Knex, id: string): Promise<void> {
  const deleted = await db('chains').where({ id }).delete();
  if (deleted === 0) throw notFound('chain');
}
