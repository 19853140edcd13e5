/**
 * The chain list: chains the viewer can see (their own, and everyone's team chains), searched by
 * name or description, optionally of one owner, sorted (newest change first unless asked), a page
 * at a time.
 */
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import { chainsWithOwner, type ChainWithOwner } from './rows';

export interface ChainQuery {
  /** Words that must all appear in the name or description (case-insensitive). */
  q?: string;
  /** Only chains of this user id. */
  ownerId?: string;
  /** 1-based page number. */
  page: number;
  pageSize: number;
  /** Column to sort by (default updatedAt) and direction (default desc). */
  sort?: ChainSortKey;
  order?: 'asc' | 'desc';
}

/** Columns the list sorts by, as the API names them. */
export type ChainSortKey = 'name' | 'updatedAt' | 'createdAt' | 'latestRevision';

const SORT_COLUMNS: Record<ChainSortKey, string> = {
  name: 'chains.name',
  updatedAt: 'chains.updated_at',
  createdAt: 'chains.created_at',
  latestRevision: 'chains.latest_revision',
};

export interface ChainPage {
  items: ChainWithOwner[];
  total: number;
  page: number;
  pageSize: number;
}

/** LIKE pattern matching `text` literally anywhere. */
function containing(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** One page of the chains `viewer` may see. */
export async function listChains(db: Knex, viewer: Actor, query: ChainQuery): Promise<ChainPage> {
  const filtered = () => {
    const builder = chainsWithOwner(db).where((visible) => visible.where('chains.owner_id', viewer.id).orWhere('chains.visibility', 'team'));
    if (query.ownerId) builder.where('chains.owner_id', query.ownerId);
    for (const word of (query.q ?? '').split(/\s+/).filter(Boolean)) {
      const pattern = containing(word.toLowerCase());
      builder.where((match) =>
        match.whereRaw("lower(chains.name) like ? escape '\\'", [pattern]).orWhereRaw("lower(chains.description) like ? escape '\\'", [pattern]),
      );
    }
    return builder;
  };
  const counted = await db.count<{ count: number | string }[]>({ count: '*' }).from(filtered().as('visible_chains')).first();
  const items = (await filtered()
    .orderByRaw(`${SORT_COLUMNS[query.sort ?? 'updatedAt']}${query.sort === 'name' ? ' collate nocase' : ''} ${query.order === 'asc' ? 'asc' : 'desc'}`)
    // A stable order among equal keys, so no chain shows on two pages.
    .orderBy('chains.id', 'asc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)) as ChainWithOwner[];
  return { items, total: Number(counted?.count ?? 0), page: query.page, pageSize: query.pageSize };
}
