import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { noContent } from '@/lib/server/api/respond';
import { endSession } from '@/lib/server/auth/session';

/** Ends the current session (if any) and clears the cookie. */
export const POST = endpoint(async (context) => {
  authorize(context, 'session.delete');
  await endSession(context.cookies, context.locals.session);
  return noContent();
});
