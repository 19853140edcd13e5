/**
 * Changing one's own password: the current password must be given (rate limited like sign-in, so a
 * borrowed session cannot guess it), and every other session of the account ends.
 */
import type { Knex } from 'knex';
import { ApiError, unprocessable } from '../api/errors';
import { findUserById, setPassword } from '../users';
import { verifyPassword } from './password';
import { assertSignInAllowed, clearAccountFailures, recordSignInFailure } from './rate-limit';
import { hashSessionId } from './session-hash';

export interface PasswordChange {
  userId: string;
  currentSessionId: string;
  currentPassword: string;
  newPassword: string;
  address: string;
}

/** Verifies the current password and stores the new one; keeps only the current session. */
export async function changePassword(db: Knex, change: PasswordChange): Promise<void> {
  const user = await findUserById(db, change.userId);
  if (!user) throw new ApiError(401, 'unauthenticated', 'Sign in to continue.');
  await assertSignInAllowed(db, user.email, change.address);
  if (!(await verifyPassword(user.password_hash, change.currentPassword))) {
    await recordSignInFailure(db, user.email, change.address);
    throw new ApiError(403, 'wrong_password', 'The current password is wrong.', 'currentPassword');
  }
  if (change.newPassword === change.currentPassword) {
    throw unprocessable('password_unchanged', 'The new password must differ from the current one.', 'newPassword');
  }
  await clearAccountFailures(db, user.email);
  await setPassword(db, user.id, change.newPassword, hashSessionId(change.currentSessionId));
}
