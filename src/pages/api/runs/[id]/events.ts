import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { loadRunFor } from '@/lib/server/runs';
import { runEventStream } from '@/lib/server/runs/event-stream';

/** Server-sent events of a run: `status` (throttled), `done` when it ends, a heartbeat comment; closes at the end. */
export const GET = endpoint(async (context) => {
  authorize(context, 'run.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const db = getDb();
  const run = await loadRunFor(db, user, context.params.id ?? '', 'run.read');
  return new Response(runEventStream(db, run.id, context.request.signal), {
    headers: {
      'Content-Type': 'text/event-stream; charset=utf-8',
      'Cache-Control': 'no-store',
      Connection: 'keep-alive',
      'X-Accel-Buffering': 'no',
    },
  });
});
