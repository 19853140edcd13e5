import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { notFound } from '@/lib/server/api/errors';
import { nameField, roleField } from '@/lib/server/api/fields';
import { updateUser } from '@/lib/server/users';
import { getDb } from '@/lib/server/db';
import { presentAccount } from '@/lib/server/presenters/user';

const UserId = z.string().uuid();

const UpdateAccount = z
  .object({ name: nameField.optional(), role: roleField.optional(), disabled: z.boolean().optional() })
  .strict()
  .refine((changes) => Object.keys(changes).length > 0, { message: 'Give at least one of name, role, disabled.' });

/** Changes an account's name, role or disabled state. */
export const PATCH = endpoint(async (context) => {
  authorize(context, 'user.update');
  const id = UserId.safeParse(context.params.id);
  if (!id.success) throw notFound('user');
  const changes = await readJson(context.request, UpdateAccount);
  const user = await updateUser(getDb(), id.data, changes);
  return json({ user: presentAccount(user) });
});
