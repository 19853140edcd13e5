/**
 * Loading a capture for an action: a missing capture and another user's private capture both
 * answer 404 (nothing leaks), a visible capture the role may not change answers 403.
 */
import type { Knex } from 'knex';
import { access, type Action, type Actor } from '@/lib/permissions';
import { forbidden, notFound, unauthenticated, type ApiError } from '../api/errors';
import { findCapture, type CaptureWithOwner } from './rows';

/** The ApiError `action` on `row` would meet, or null when allowed. */
export function refusal(user: Actor | null, action: Action, row: CaptureWithOwner | undefined): ApiError | null {
  if (!row) return notFound('capture');
  const outcome = access(user, action, { ownerId: row.owner_id, visibility: row.visibility });
  if (outcome === 'allowed') return null;
  if (outcome === 'unauthenticated') return unauthenticated();
  if (outcome === 'forbidden') return forbidden(action === 'capture.read' ? undefined : 'Only the owner or an admin may change this capture.');
  return notFound('capture');
}

/** The capture `id` if `user` may do `action` to it; throws 404/403 otherwise. */
export async function loadCaptureFor(db: Knex, user: Actor | null, id: string, action: Action): Promise<CaptureWithOwner> {
  const row = await findCapture(db, id);
  const refused = refusal(user, action, row);
  if (refused) throw refused;
  return row!;
}
