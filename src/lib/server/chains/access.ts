/**
 * The first step of every `/api/chains/:id/...` endpoint: find the chain named by the route and
 * check the action on it, so a malformed id, a missing chain and someone else's private chain all
 * answer the same 404.
 */
import type { APIContext } from 'astro';
import type { Action } from '@/lib/permissions';
import { authorize } from '../api/endpoint';
import { notFound } from '../api/errors';
import { getDb } from '../db';
import { chainResource, findChain, type ChainWithOwner } from './rows';

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The route's chain, once `action` on it is allowed (else 401, 403 or 404). */
export async function requireChain(context: APIContext, action: Action): Promise<ChainWithOwner> {
  const id = context.params.id ?? '';
  const chain = uuidPattern.test(id) ? await findChain(getDb(), id) : undefined;
  if (!chain) throw notFound('chain');
  authorize(context, action, chainResource(chain), 'chain');
  return chain;
}

/** A revision number from the route or query (1, 2, ...), or undefined when it is not one. */
export function revisionNumber(text: string | null | undefined): number | undefined {
  if (!text || !/^[1-9][0-9]{0,8}$/.test(text)) return undefined;
  return Number(text);
}
