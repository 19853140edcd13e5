import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { badRequest, forbidden, unauthenticated } from '@/lib/server/api/errors';
import { parseWith, readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { can } from '@/lib/permissions';
import { getRunScheduler, listRuns, presentRun, submitRuns } from '@/lib/server/runs';
import { ListRunsQuery, SubmitRunsBody } from '@/lib/server/runs/fields';

/** Runs the user can see, newest first; `?all=1` (admins) the whole queue; filters status, chain_id, capture_id, mine; `cursor` (the answer's nextCursor) or `page`. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const query = parseWith(ListRunsQuery, Object.fromEntries(context.url.searchParams));
  if (query.all && !can(user, 'queue.manage')) throw forbidden('Only an admin may see the whole queue.');
  const page = await listRuns(getDb(), user, {
    all: query.all,
    mine: query.mine,
    statuses: query.status,
    chainId: query.chain_id,
    captureId: query.capture_id,
    page: query.page,
    pageSize: query.page_size,
    cursor: query.cursor,
  });
  return json({
    runs: page.items.map((run) => presentRun(run, user)),
    total: page.total,
    page: query.page,
    pageSize: query.page_size,
    nextCursor: page.nextCursor,
  });
});

/** Asks for a chain revision to run on one capture or several (one run each); cached results answer at once. */
export const POST = endpoint(async (context) => {
  authorize(context, 'run.create');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const body = await readJson(context.request, SubmitRunsBody);
  if ((body.capture_id === undefined) === (body.capture_ids === undefined)) {
    throw badRequest('required', 'Give capture_id (one capture) or capture_ids (several), not both.', 'capture_id');
  }
  const single = body.capture_id !== undefined;
  const runs = await submitRuns(getDb(), user, {
    chainId: body.chain_id,
    revision: body.revision,
    captureIds: single ? [body.capture_id!] : body.capture_ids!,
    captureField: (index) => (single ? 'capture_id' : `capture_ids.${index}`),
  });
  if (runs.some((run) => run.status === 'queued')) getRunScheduler().wake();
  return json({ runs }, 202);
});
