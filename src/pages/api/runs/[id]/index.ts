import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { loadRunFor, presentRun, summaryOf } from '@/lib/server/runs';

/** A run: status, progress, timings, whether it came from the cache and, once succeeded, its summary (readouts, issues, timing, test points). */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  const summary = run.status === 'succeeded' ? await summaryOf(db, run) : undefined;
  return json(presentRun(run, user, summary));
});
