import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { badRequest, unauthenticated } from '@/lib/server/api/errors';
import { parseWith, readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { createChain, listChains, presentChain } from '@/lib/server/chains';
import { chainBodyLimitBytes, chainNameField, CreateChainBody, ListQuery } from '@/lib/server/chains/fields';

/**
 * Chains the user can see: `?q=` words in name or description, `?owner=` a user id or `me`,
 * `?sort=name|updatedAt|createdAt|latestRevision&order=asc|desc` (default updatedAt desc), `?page=&pageSize=`.
 */
export const GET = endpoint(async (context) => {
  authorize(context, 'chain.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const query = parseWith(ListQuery, Object.fromEntries(context.url.searchParams));
  const ownerId = query.owner === 'me' ? user.id : query.owner;
  const page = await listChains(getDb(), user, { q: query.q, ownerId, page: query.page, pageSize: query.pageSize, sort: query.sort, order: query.order });
  return json({ ...page, items: page.items.map((chain) => presentChain(chain, user)) });
});

/**
 * Creates a chain (or imports one: the body's `document` is a chain file as exported) with
 * revision 1. Without `name`, the document's own name is used.
 */
export const POST = endpoint(async (context) => {
  authorize(context, 'chain.create');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const body = await readJson(context.request, CreateChainBody, chainBodyLimitBytes);
  const name = body.name ?? nameOfDocument(body.document);
  const { chain, revision } = await createChain(getDb(), {
    ownerId: user.id,
    name,
    description: body.description,
    visibility: body.visibility,
    document: body.document,
    message: body.message ?? 'Created',
  });
  return json({ id: chain.id, revision: revision.revision }, 201);
});

function nameOfDocument(document: unknown): string {
  const name = typeof document === 'object' && document !== null ? (document as { name?: unknown }).name : undefined;
  const parsed = chainNameField.safeParse(name);
  if (!parsed.success) throw badRequest('required', 'name is required (the document has no usable name either).', 'name');
  return parsed.data;
}
