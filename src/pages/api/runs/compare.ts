import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { compareResults, loadComparedRuns, loadRunsFor, presentRun } from '@/lib/server/runs';
import { CompareQuery } from '@/lib/server/runs/fields';

/** Two to ten runs side by side: `?ids=a,b`; spectra reduced to `width` points, readouts with differences from the first run. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const query = parseWith(CompareQuery, Object.fromEntries(context.url.searchParams));
  const runs = await loadRunsFor(db, user, query.ids, 'ids');
  const compared = await loadComparedRuns(db, runs);
  return json({ runs: runs.map((run) => presentRun(run, user)), ...compareResults(compared, query.width) });
});
