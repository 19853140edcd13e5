import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { handleTus } from '@/lib/server/uploads';

/** tus creation: starts a resumable upload once its metadata and length pass the checks. */
export const POST = endpoint(async (context) => {
  authorize(context, 'capture.create');
  return handleTus(context.request, context.locals.user!);
});
