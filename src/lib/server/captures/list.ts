/**
 * The captures list: what a user can see (own captures and team captures), filtered, sorted and
 * paged in SQL.
 */
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import { captureQuery, type CaptureWithOwner } from './rows';

export const sortKeys = { name: 'captures.name collate nocase', createdAt: 'captures.created_at', byteSize: 'captures.byte_size', sampleRate: 'captures.sample_rate' } as const;
export type SortKey = keyof typeof sortKeys;

/** Filters and paging of GET /api/captures (already validated). */
export interface CaptureListQuery {
  /** Text searched in name, notes and tags. */
  q?: string;
  /** `me`, `team` (team-visible captures) or a user id. */
  owner?: string;
  tag?: string;
  layout?: string;
  datatype?: string;
  /** Hz. */
  minRate?: number;
  /** Hz. */
  maxRate?: number;
  sort: SortKey;
  order: 'asc' | 'desc';
  /** 1-based. */
  page: number;
  pageSize: number;
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** The page of captures `viewer` asked for, and how many match in all. */
export async function listCaptures(db: Knex, viewer: Actor, query: CaptureListQuery): Promise<{ items: CaptureWithOwner[]; total: number }> {
  const filtered = (builder: Knex.QueryBuilder) => {
    builder.where((visible) => visible.where('captures.owner_id', viewer.id).orWhere('captures.visibility', 'team'));
    if (query.owner === 'me') builder.where('captures.owner_id', viewer.id);
    else if (query.owner === 'team') builder.where('captures.visibility', 'team');
    else if (query.owner) builder.where('captures.owner_id', query.owner);
    if (query.q) {
      const pattern = `%${escapeLike(query.q)}%`;
      builder.where((text) =>
        text
          .whereRaw("captures.name like ? escape '\\'", [pattern])
          .orWhereRaw("captures.notes like ? escape '\\'", [pattern])
          .orWhereRaw("exists (select 1 from json_each(captures.tags) where json_each.value like ? escape '\\')", [pattern]),
      );
    }
    if (query.tag) builder.whereRaw('exists (select 1 from json_each(captures.tags) where json_each.value = ?)', [query.tag]);
    if (query.layout) builder.where('captures.layout', query.layout);
    if (query.datatype) builder.where('captures.datatype', query.datatype);
    if (query.minRate !== undefined) builder.where('captures.sample_rate', '>=', query.minRate);
    if (query.maxRate !== undefined) builder.where('captures.sample_rate', '<=', query.maxRate);
    return builder;
  };
  const counted = await filtered(db('captures')).count<{ count: number }[]>({ count: '*' }).first();
  const items = (await filtered(captureQuery(db))
    // Both parts come from fixed lists, never from the request text.
    .orderByRaw(`${sortKeys[query.sort]} ${query.order === 'desc' ? 'desc' : 'asc'}`)
    .orderBy('captures.id', 'asc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)) as CaptureWithOwner[];
  return { items, total: Number(counted?.count ?? 0) };
}
