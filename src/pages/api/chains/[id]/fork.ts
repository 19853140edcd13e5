import { endpoint } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { forkChain, requireChain } from '@/lib/server/chains';
import { ForkBody } from '@/lib/server/chains/fields';

/** Copies a revision (default: the latest) into a new private chain of the caller. */
export const POST = endpoint(async (context) => {
  const source = await requireChain(context, 'chain.fork');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const body = await readJson(context.request, ForkBody);
  const { chain, revision } = await forkChain(getDb(), source, { forkerId: user.id, revision: body.revision, name: body.name });
  return json({ id: chain.id, revision: revision.revision }, 201);
});
