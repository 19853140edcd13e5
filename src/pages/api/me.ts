import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { json } from '@/lib/server/api/respond';
import { unauthenticated } from '@/lib/server/api/errors';
import { presentUser } from '@/lib/server/presenters/user';

/** The signed-in user: id, email, name, role. */
export const GET = endpoint(async (context) => {
  authorize(context, 'account.read');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  return json(presentUser(user));
});
