import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { conflict, unauthenticated } from '@/lib/server/api/errors';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { findRun, finishedStatuses, getRunScheduler, loadRunFor, presentRun } from '@/lib/server/runs';

/** Cancels a queued run at once or stops a running one (its worker stops within a block); admins may cancel any run. */
export const POST = endpoint(async (context) => {
  authorize(context, 'run.cancel');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.cancel');
  if (finishedStatuses.has(run.status)) throw conflict('already_finished', `This run has already ${run.status === 'succeeded' ? 'succeeded' : `ended (${run.status})`}.`);
  await getRunScheduler().cancel(run);
  return json(presentRun((await findRun(db, run.id))!, user), 202);
});
