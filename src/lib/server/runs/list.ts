/**
 * The runs list: the viewer's own runs and other users' runs on team chains and team captures;
 * with `all` (admins, queue.manage) every run in the queue. Newest first, a page at a time,
 * optionally filtered by status, chain, capture or requester.
 */
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import { runQuery, type RunStatus, type RunView } from './rows';

export interface RunQuery {
  all: boolean;
  /** Only the viewer's own runs. */
  mine: boolean;
  statuses: RunStatus[];
  chainId?: string;
  captureId?: string;
  /** 1-based. */
  page: number;
  pageSize: number;
}

/** One page of the runs `viewer` may list, and how many there are in all. */
export async function listRuns(db: Knex, viewer: Actor, query: RunQuery): Promise<{ items: RunView[]; total: number }> {
  const filtered = () => {
    const builder = runQuery(db);
    if (query.mine) builder.where('runs.requested_by', viewer.id);
    else if (!query.all) {
      builder.where((visible) =>
        visible
          .where('runs.requested_by', viewer.id)
          .orWhere((shared) => shared.where('chains.visibility', 'team').andWhere('captures.visibility', 'team')),
      );
    }
    if (query.statuses.length > 0) builder.whereIn('runs.status', query.statuses);
    if (query.chainId) builder.where('runs.chain_id', query.chainId);
    if (query.captureId) builder.where('runs.capture_id', query.captureId);
    return builder;
  };
  const counted = (await db.count({ count: '*' }).from(filtered().as('listed')).first()) as { count: number | string } | undefined;
  const items = (await filtered()
    .orderBy('runs.created_at', 'desc')
    .orderBy('runs.id', 'asc')
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)) as RunView[];
  return { items, total: Number(counted?.count ?? 0) };
}
