import { endpoint } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { presentRevision, requireChain, restoreRevision } from '@/lib/server/chains';
import { RestoreBody } from '@/lib/server/chains/fields';

/** Makes a new revision equal to an earlier one; history is never rewritten. */
export const POST = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.update');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const body = await readJson(context.request, RestoreBody);
  const revision = await restoreRevision(getDb(), chain.id, user.id, body.revision, body.message);
  return json(presentRevision(revision), 201);
});
