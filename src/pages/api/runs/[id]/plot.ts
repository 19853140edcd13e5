import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { loadRunFor, plotData, resultsOf } from '@/lib/server/runs';
import { PlotQuery } from '@/lib/server/runs/fields';

/** One probe's plot data reduced to at most `width` points per row: `?probe=<stageId>&kind=spectrum|spectrogram|trace|constellation&width=<px>`. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  const query = parseWith(PlotQuery, Object.fromEntries(context.url.searchParams));
  return json(plotData(await resultsOf(db, run), query.probe, query.kind, query.width));
});
