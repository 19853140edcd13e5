import { endpoint } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json, noContent } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { deleteChain, getRevision, presentChain, presentRevision, requireChain, updateChain } from '@/lib/server/chains';
import { UpdateChainBody } from '@/lib/server/chains/fields';

/** The chain, with its latest revision (document included). */
export const GET = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.read');
  const revision = await getRevision(getDb(), chain.id, Number(chain.latest_revision));
  return json({ ...presentChain(chain, context.locals.user), revision: presentRevision(revision) });
});

/** Changes name, description or visibility; the document changes only by new revisions. */
export const PATCH = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.update');
  const changes = await readJson(context.request, UpdateChainBody);
  const updated = await updateChain(getDb(), chain.id, changes);
  return json(presentChain(updated, context.locals.user));
});

/** Deletes the chain and its revisions. */
export const DELETE = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.delete');
  await deleteChain(getDb(), chain.id);
  return noContent();
});
