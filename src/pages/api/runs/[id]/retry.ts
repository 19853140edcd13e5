import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { forbidden, unauthenticated } from '@/lib/server/api/errors';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { can } from '@/lib/permissions';
import { getRunScheduler, loadRunFor, retryRun, runResource } from '@/lib/server/runs';

/** Runs a failed or cancelled run again as a new attempt (same chain revision and capture); only its requester may. */
export const POST = endpoint(async (context) => {
  authorize(context, 'run.create');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  if (!can(user, 'run.cancel', runResource(run))) throw forbidden('Only the person who asked for this run may retry it.');
  const submitted = await retryRun(db, user, run);
  if (submitted.status === 'queued') getRunScheduler().wake();
  return json({ runs: [submitted] }, 202);
});
