import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { emailField, passwordField } from '@/lib/server/api/fields';
import { checkCredentials } from '@/lib/server/auth/sign-in';
import { endSession, startSession } from '@/lib/server/auth/session';
import { getDb } from '@/lib/server/db';
import { presentUser } from '@/lib/server/presenters/user';

const SignIn = z.object({ email: emailField, password: passwordField }).strict();

/** Signs in with e-mail and password; sets the session cookie and answers the user. */
export const POST = endpoint(async (context) => {
  authorize(context, 'session.create');
  const input = await readJson(context.request, SignIn);
  const user = await checkCredentials(getDb(), input.email, input.password, context.clientAddress);
  // A fresh session id on every sign-in, so an id planted before sign-in is worthless.
  await endSession(context.cookies, context.locals.session);
  await startSession(context.cookies, user.id);
  return json({ user: presentUser(user) });
});
