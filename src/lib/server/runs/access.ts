/**
 * Loading a run for an action: a missing run and another user's private run both answer 404; an
 * admin may cancel any run in the queue (queue.manage) without seeing what it holds.
 */
import type { Knex } from 'knex';
import { access, can, type Action, type Actor } from '@/lib/permissions';
import { ApiError, forbidden, notFound, unauthenticated } from '../api/errors';
import { findRun, runQuery, runResource, type RunView } from './rows';

/** The run `id` if `user` may do `action` to it; throws 401/403/404 otherwise. */
export async function loadRunFor(db: Knex, user: Actor | null, id: string, action: Action): Promise<RunView> {
  if (!user) throw unauthenticated();
  const run = await findRun(db, id);
  if (!run) throw notFound('run');
  if (action === 'run.cancel' && can(user, 'queue.manage')) return run;
  const outcome = access(user, action, runResource(run));
  if (outcome === 'hidden') throw notFound('run');
  if (outcome === 'forbidden') throw forbidden(action === 'run.cancel' ? 'Only the person who asked for this run (or an admin) may do this.' : undefined);
  if (outcome === 'unauthenticated') throw unauthenticated();
  return run;
}

/**
 * The runs `ids` (in that order) that `user` may read, in one query; 404 naming `field` with the
 * first id that is missing or hidden.
 */
export async function loadRunsFor(db: Knex, user: Actor | null, ids: string[], field: string): Promise<RunView[]> {
  if (!user) throw unauthenticated();
  const wellFormed = ids.filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  const rows = wellFormed.length > 0 ? ((await runQuery(db).whereIn('runs.id', wellFormed)) as RunView[]) : [];
  const byId = new Map(rows.map((run) => [run.id, run]));
  return ids.map((id) => {
    const run = byId.get(id);
    if (!run || access(user, 'run.read', runResource(run)) !== 'allowed') throw new ApiError(404, 'not_found', `No such run: ${id}.`, field);
    return run;
  });
}
