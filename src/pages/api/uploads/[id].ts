import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { methodNotAllowed } from '@/lib/server/api/errors';
import { handleTus } from '@/lib/server/uploads';

const tusMethods = ['HEAD', 'PATCH', 'DELETE'];

/**
 * One resumable upload: HEAD (offset to resume from), PATCH (append bytes), DELETE (cancel,
 * nothing kept). Only the uploader may touch it; others get 404.
 */
export const ALL = endpoint(async (context) => {
  if (!tusMethods.includes(context.request.method)) throw methodNotAllowed(tusMethods);
  authorize(context, 'capture.create');
  return handleTus(context.request, context.locals.user!);
});
