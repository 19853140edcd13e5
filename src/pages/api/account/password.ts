import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { noContent } from '@/lib/server/api/respond';
import { unauthenticated } from '@/lib/server/api/errors';
import { newPasswordField, passwordField } from '@/lib/server/api/fields';
import { changePassword } from '@/lib/server/auth/change-password';
import { getDb } from '@/lib/server/db';

const ChangePassword = z.object({ currentPassword: passwordField, newPassword: newPasswordField }).strict();

/** Changes the signed-in user's password; every other session of the account ends. */
export const POST = endpoint(async (context) => {
  authorize(context, 'account.update');
  const { user, session } = context.locals;
  if (!user || !session) throw unauthenticated();
  const input = await readJson(context.request, ChangePassword);
  await changePassword(getDb(), { userId: user.id, currentSessionId: session.id, address: context.clientAddress, ...input });
  return noContent();
});
