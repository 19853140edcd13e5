/**
 * Wraps an endpoint handler so any thrown ApiError (or bug) becomes the standard JSON error, and
 * gives handlers one call to check access.
 */
import type { APIContext, APIRoute } from 'astro';
import { access, type Action, type OwnedResource } from '@/lib/permissions';
import { forbidden, notFound, unauthenticated } from './errors';
import { errorResponse } from './respond';

/** An endpoint whose errors are rendered as JSON. */
export function endpoint(handler: (context: APIContext) => Promise<Response>): APIRoute {
  return async (context) => {
    try {
      return await handler(context);
    } catch (error) {
      return errorResponse(error);
    }
  };
}

/**
 * Throws 401, 403 or 404 unless the signed-in user may do `action` (to `resource`); `what` names
 * the item in the 404 message.
 */
export function authorize(context: APIContext, action: Action, resource?: OwnedResource, what?: string): void {
  const outcome = access(context.locals.user, action, resource);
  if (outcome === 'unauthenticated') throw unauthenticated();
  if (outcome === 'forbidden') throw forbidden();
  if (outcome === 'hidden') throw notFound(what);
}
