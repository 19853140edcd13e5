/**
 * Database rows of chains and their revisions, and the lookups every chain command shares. Rows
 * never leave the server: presenters shape them for answers.
 */
import type { Knex } from 'knex';
import type { OwnedResource } from '@/lib/permissions';
import type { Visibility } from '@/contracts/capture';

export type { Visibility };

export interface ChainRow {
  id: string;
  owner_id: string;
  name: string;
  description: string;
  visibility: Visibility;
  latest_revision: number;
  forked_from_chain_id: string | null;
  forked_from_revision: number | null;
  created_at: string;
  updated_at: string;
}

/** A chain with its owner's display name, as lookups return it. */
export interface ChainWithOwner extends ChainRow {
  owner_name: string;
}

export interface ChainRevisionRow {
  id: string;
  chain_id: string;
  revision: number;
  /** The validated chain document as canonical JSON text. */
  document: string;
  message: string;
  author_id: string;
  /** SHA-256 (hex) of canonicalChainJson(document). */
  hash: string;
  created_at: string;
}

/** A revision with its author's display name. */
export interface RevisionWithAuthor extends ChainRevisionRow {
  author_name: string;
}

/** Chains joined with their owners' names (a query to refine). */
export function chainsWithOwner(db: Knex): Knex.QueryBuilder {
  return db('chains').join('users', 'users.id', 'chains.owner_id').select('chains.*', 'users.name as owner_name');
}

/** The chain with this id, or undefined. */
export async function findChain(db: Knex, id: string): Promise<ChainWithOwner | undefined> {
  return (await chainsWithOwner(db).where('chains.id', id).first()) as ChainWithOwner | undefined;
}

/** The ownership facts the permission table needs. */
export function chainResource(chain: Pick<ChainRow, 'owner_id' | 'visibility'>): OwnedResource {
  return { ownerId: chain.owner_id, visibility: chain.visibility };
}

const revisionColumns = [
  'chain_revisions.id',
  'chain_revisions.chain_id',
  'chain_revisions.revision',
  'chain_revisions.message',
  'chain_revisions.author_id',
  'chain_revisions.hash',
  'chain_revisions.created_at',
  'users.name as author_name',
];

/** Revisions joined with their authors' names; `withDocument` adds the (possibly large) document. */
export function revisionsWithAuthor(db: Knex, withDocument: boolean): Knex.QueryBuilder {
  const columns = withDocument ? [...revisionColumns, 'chain_revisions.document'] : revisionColumns;
  return db('chain_revisions').join('users', 'users.id', 'chain_revisions.author_id').select(columns);
}

/** Revision `revision` of a chain (with its document), or undefined. */
export async function findRevision(db: Knex, chainId: string, revision: number): Promise<RevisionWithAuthor | undefined> {
  return (await revisionsWithAuthor(db, true).where({ 'chain_revisions.chain_id': chainId, 'chain_revisions.revision': revision }).first()) as
    | RevisionWithAuthor
    | undefined;
}
