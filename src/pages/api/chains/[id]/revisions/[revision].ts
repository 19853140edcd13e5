import { endpoint } from '@/lib/server/api/endpoint';
import { notFound } from '@/lib/server/api/errors';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { getRevision, presentRevision, requireChain, revisionNumber } from '@/lib/server/chains';

/** One revision with its document. Revisions are immutable: this route has no write method. */
export const GET = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.read');
  const number = revisionNumber(context.params.revision);
  if (number === undefined) throw notFound('revision');
  return json(presentRevision(await getRevision(getDb(), chain.id, number)));
});
