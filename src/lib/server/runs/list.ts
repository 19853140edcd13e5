/**
 * The runs list: the viewer's own runs and other users' runs on team chains and team captures;
 * with `all` (admins, queue.manage) every run in the queue. Newest first (id breaks ties), a page at
 * a time, optionally filtered by status, chain, capture or requester. Pages are found by keyset
 * (`cursor`: the last run of the previous page) over the runs(created_at, id), (capture_id,
 * created_at, id) and (chain_id, created_at, id) indexes; a page number still works (offset) for
 * the list page's numbered links.
 */
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import { badRequest } from '../api/errors';
import { runQuery, type RunStatus, type RunView } from './rows';

export interface RunQuery {
  all: boolean;
  /** Only the viewer's own runs. */
  mine: boolean;
  statuses: RunStatus[];
  chainId?: string;
  captureId?: string;
  /** 1-based; ignored when `cursor` is given. */
  page: number;
  pageSize: number;
  /** A `nextCursor` of an earlier answer. */
  cursor?: string;
}

/** The position after `run` in the list's order, as an opaque text. */
export function encodeCursor(run: Pick<RunView, 'created_at' | 'id'>): string {
  return Buffer.from(JSON.stringify([run.created_at, run.id])).toString('base64url');
}

function decodeCursor(cursor: string): [string, string] {
  try {
    const value = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8')) as unknown;
    if (Array.isArray(value) && value.length === 2 && value.every((part) => typeof part === 'string')) return value as [string, string];
  } catch {
    // Falls through to the 400 below.
  }
  throw badRequest('invalid_field', 'cursor is not one this list gave out.', 'cursor');
}

/** The list query of `viewer` before ordering and paging (the plan test reads it too). */
export function filteredRuns(db: Knex, viewer: Actor, query: Omit<RunQuery, 'page' | 'pageSize' | 'cursor'>): Knex.QueryBuilder {
  const builder = runQuery(db);
  if (query.mine) builder.where('runs.requested_by', viewer.id);
  else if (!query.all) {
    builder.where((visible) =>
      visible.where('runs.requested_by', viewer.id).orWhere((shared) => shared.where('chains.visibility', 'team').andWhere('captures.visibility', 'team')),
    );
  }
  if (query.statuses.length > 0) builder.whereIn('runs.status', query.statuses);
  if (query.chainId) builder.where('runs.chain_id', query.chainId);
  if (query.captureId) builder.where('runs.capture_id', query.captureId);
  return builder;
}

/** Newest first; the id breaks ties in the same direction, so one index serves the whole ORDER BY. */
export function newestFirst(builder: Knex.QueryBuilder): Knex.QueryBuilder {
  return builder.orderBy('runs.created_at', 'desc').orderBy('runs.id', 'desc');
}

/** One page of the runs `viewer` may list, how many there are in all, and the cursor of the next page (null on the last). */
export async function listRuns(db: Knex, viewer: Actor, query: RunQuery): Promise<{ items: RunView[]; total: number; nextCursor: string | null }> {
  const counted = (await db.count({ count: '*' }).from(filteredRuns(db, viewer, query).as('listed')).first()) as { count: number | string } | undefined;
  const page = newestFirst(filteredRuns(db, viewer, query)).limit(query.pageSize + 1);
  if (query.cursor) {
    const [createdAt, id] = decodeCursor(query.cursor);
    page.whereRaw('(runs.created_at, runs.id) < (?, ?)', [createdAt, id]);
  } else {
    page.offset((query.page - 1) * query.pageSize);
  }
  const rows = (await page) as RunView[];
  const items = rows.slice(0, query.pageSize);
  const nextCursor = rows.length > query.pageSize ? encodeCursor(items[items.length - 1]!) : null;
  return { items, total: Number(counted?.count ?? 0), nextCursor };
}
