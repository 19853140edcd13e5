import { z } from 'zod';
import { endpoint } from '@/lib/server/api/endpoint';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { diffRevisions, requireChain } from '@/lib/server/chains';

const revision = z
  .string()
  .regex(/^[1-9][0-9]{0,8}$/, 'must be a revision number (1, 2, ...)')
  .transform(Number);
const DiffQuery = z.object({ from: revision, to: revision }).strict();

/** Parameter-level changes from revision `?from=` to revision `?to=`. */
export const GET = endpoint(async (context) => {
  const chain = await requireChain(context, 'chain.read');
  const query = parseWith(DiffQuery, Object.fromEntries(context.url.searchParams));
  const changes = await diffRevisions(getDb(), chain.id, query.from, query.to);
  return json({ from: query.from, to: query.to, changes });
});
