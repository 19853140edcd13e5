import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { conflict } from '@/lib/server/api/errors';
import { emailField, nameField, newPasswordField } from '@/lib/server/api/fields';
import { createFirstAdmin } from '@/lib/server/setup';
import { startSession } from '@/lib/server/auth/session';
import { getDb } from '@/lib/server/db';
import { presentUser } from '@/lib/server/presenters/user';

const Setup = z.object({ email: emailField, name: nameField, password: newPasswordField }).strict();

/** Creates the first account (an admin) on an empty database and signs it in; 409 afterwards. */
export const POST = endpoint(async (context) => {
  authorize(context, 'setup.create');
  const input = await readJson(context.request, Setup);
  const user = await createFirstAdmin(getDb(), input);
  if (!user) throw conflict('already_set_up', 'Quadrille already has accounts: ask an admin for one.');
  await startSession(context.cookies, user.id);
  return json({ user: presentUser(user) }, 201);
});
