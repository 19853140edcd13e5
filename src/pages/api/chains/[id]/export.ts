import { endpoint } from '@/lib/server/api/endpoint';
import { badRequest } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { exportResponse, getRevision, requireChain, revisionNumber } from '@/lib/server/chains';

/** The document of `?revision=` (default: the latest) as a chain file download. */
export const GET = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.read');
  const asked = context.url.searchParams.get('revision');
  const number = asked === null ? Number(chain.latest_revision) : revisionNumber(asked);
  if (number === undefined) throw badRequest('invalid_field', 'revision: must be a revision number (1, 2, ...).', 'revision');
  return exportResponse(chain.name, await getRevision(getDb(), chain.id, number));
});
