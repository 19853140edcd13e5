import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { loadRunFor, presentRun, resultsOf } from '@/lib/server/runs';

/** A run: status, progress, timings, whether it came from the cache and, once succeeded, its results. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  const results = run.status === 'succeeded' ? await resultsOf(db, run) : undefined;
  return json(presentRun(run, user, results));
});
