import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { ApiError, unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { compareResults, loadRunFor, presentRun, resultsOf, type RunResults } from '@/lib/server/runs';
import { CompareQuery } from '@/lib/server/runs/fields';

/** Two to ten runs side by side: `?ids=a,b`; spectra reduced to `width` points, readouts with differences from the first run. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const query = parseWith(CompareQuery, Object.fromEntries(context.url.searchParams));
  const runs = [];
  for (const id of query.ids) {
    try {
      runs.push(await loadRunFor(db, user, id, 'run.read'));
    } catch (error) {
      if (error instanceof ApiError && error.status === 404) throw new ApiError(404, 'not_found', `No such run: ${id}.`, 'ids');
      throw error;
    }
  }
  const withResults: { runId: string; results: RunResults }[] = [];
  for (const run of runs) if (run.status === 'succeeded') withResults.push({ runId: run.id, results: await resultsOf(db, run) });
  return json({ runs: runs.map((run) => presentRun(run, user)), ...compareResults(withResults, query.width) });
});
