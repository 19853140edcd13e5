import { endpoint } from '@/lib/server/api/endpoint';
import { unauthenticated } from '@/lib/server/api/errors';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { addRevision, listRevisions, presentRevision, presentRevisionSummary, requireChain } from '@/lib/server/chains';
import { AddRevisionBody, chainBodyLimitBytes } from '@/lib/server/chains/fields';

/** The chain's revisions, newest first, without their documents. */
export const GET = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.read');
  const revisions = await listRevisions(getDb(), chain.id);
  return json({ items: revisions.map(presentRevisionSummary) });
});

/** Saves a new immutable revision; answers it with its number. */
export const POST = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.update');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const body = await readJson(context.request, AddRevisionBody, chainBodyLimitBytes);
  const revision = await addRevision(getDb(), chain.id, user.id, body.document, body.message);
  return json(presentRevision(revision), 201);
});
