import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { emailField, nameField, newPasswordField, roleField } from '@/lib/server/api/fields';
import { createUser, listUsers } from '@/lib/server/users';
import { getDb } from '@/lib/server/db';
import { presentAccount } from '@/lib/server/presenters/user';

const CreateAccount = z.object({ email: emailField, name: nameField, role: roleField, password: newPasswordField }).strict();

/** Every account, for the admin pages. */
export const GET = endpoint(async (context) => {
  authorize(context, 'user.list');
  const users = await listUsers(getDb());
  return json({ users: users.map(presentAccount) });
});

/** Creates an account with a role and an initial password (invitations come later). */
export const POST = endpoint(async (context) => {
  authorize(context, 'user.create');
  const input = await readJson(context.request, CreateAccount);
  const user = await createUser(getDb(), input);
  return json({ user: presentAccount(user) }, 201);
});
