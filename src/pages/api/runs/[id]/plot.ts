import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { loadRunFor, probePlotOf, reducePlot } from '@/lib/server/runs';
import { PlotQuery } from '@/lib/server/runs/fields';

/**
 * One probe's plot data reduced to at most `width` points per row:
 * `?probe=<stageId>&kind=spectrum|spectrogram|trace|constellation&width=<px>`; `full=1` (spectrum
 * only) sends every bin. Reads that one probe's stored preview, never the whole results.
 */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  const query = parseWith(PlotQuery, Object.fromEntries(context.url.searchParams));
  const plot = await probePlotOf(db, run, query.probe, query.kind, query.full);
  return json(query.full ? plot : reducePlot(plot, query.width));
});
