import type { APIContext } from 'astro';
import { describe, expect, it } from 'vitest';
import { authorize } from '@/lib/server/api/endpoint';
import { ApiError } from '@/lib/server/api/errors';
import { errorResponse } from '@/lib/server/api/respond';
import type { Role } from '@/lib/permissions';

/** Just enough of an Astro context for authorize(), which reads only locals.user. */
function contextFor(user: { id: string; role: Role } | null): APIContext {
  return { locals: { user: user && { ...user, email: 'x@saltmarsh.test', name: 'X' }, session: null } } as unknown as APIContext;
}

function statusOf(run: () => void): number | 'allowed' {
  try {
    run();
    return 'allowed';
  } catch (error) {
    if (error instanceof ApiError) return error.status;
    throw error;
  }
}

const engineer = { id: 'engineer-1', role: 'engineer' as const };
const operator = { id: 'operator-1', role: 'operator' as const };
const admin = { id: 'admin-1', role: 'admin' as const };

describe('authorize() turns the table into HTTP statuses', () => {
  it.each([
    ['signed out, signed-in action', null, 'chain.read', undefined, 401],
    ['operator on an admin action', operator, 'user.list', undefined, 403],
    ["operator editing a team chain", operator, 'chain.update', { ownerId: engineer.id, visibility: 'team' as const }, 403],
    ["engineer reading another user's private capture", engineer, 'capture.read', { ownerId: operator.id, visibility: 'private' as const }, 404],
    ["operator editing another user's private chain: 404, not 403", operator, 'chain.update', { ownerId: engineer.id, visibility: 'private' as const }, 404],
    ["admin reading another user's private run", admin, 'run.read', { ownerId: engineer.id, visibility: 'private' as const }, 404],
    ['operator rerunning a team chain', operator, 'run.create', { ownerId: engineer.id, visibility: 'team' as const }, 'allowed'],
    ['engineer editing an own private chain', engineer, 'chain.update', { ownerId: engineer.id, visibility: 'private' as const }, 'allowed'],
  ] as const)('%s', (_label, user, action, resource, want) => {
    expect(statusOf(() => authorize(contextFor(user), action, resource))).toBe(want);
  });

  it('renders a hidden item exactly like a missing one', async () => {
    let hidden: unknown;
    try {
      authorize(contextFor(engineer), 'capture.read', { ownerId: operator.id, visibility: 'private' }, 'capture');
    } catch (error) {
      hidden = error;
    }
    const response = errorResponse(hidden);
    expect(response.status).toBe(404);
    expect(await response.json()).toEqual({ error: { code: 'not_found', message: 'No such capture.', field: null } });
  });
});
