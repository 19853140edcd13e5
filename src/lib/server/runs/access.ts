/**
 * Loading a run for an action: a missing run and another user's private run both answer 404; an
 * admin may cancel any run in the queue (queue.manage) without seeing what it holds.
 */
import type { Knex } from 'knex';
import { access, can, type Action, type Actor } from '@/lib/permissions';
import { forbidden, notFound, unauthenticated } from '../api/errors';
import { findRun, runResource, type RunView } from './rows';

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
