/**
 * The sign-in command: rate limit, verify the password, refuse disabled accounts.
 */
import type { Knex } from 'knex';
import { ApiError } from '../api/errors';
import { findUserByEmail, touchSignIn, type UserRow } from '../users';
import { verifyAgainstDecoy, verifyPassword } from './password';
import { assertSignInAllowed, clearAccountFailures, recordSignInFailure } from './rate-limit';

/** 401 for a wrong password and an unknown e-mail alike, so accounts cannot be discovered. */
function invalidCredentials(): ApiError {
  return new ApiError(401, 'invalid_credentials', 'E-mail or password is wrong.');
}

/**
 * Checks `email` and `password` from client `address`; returns the account or throws 401
 * `invalid_credentials`, 403 `account_disabled` or 429 `rate_limited`. Starts no session.
 */
export async function checkCredentials(db: Knex, email: string, password: string, address: string): Promise<UserRow> {
  await assertSignInAllowed(db, email, address);
  const user = await findUserByEmail(db, email);
  const valid = user ? await verifyPassword(user.password_hash, password) : await verifyAgainstDecoy(password);
  if (!user || !valid) {
    await recordSignInFailure(db, email, address);
    throw invalidCredentials();
  }
  // Told only to someone who knows the password, so it reveals nothing to a guesser.
  if (user.disabled_at) {
    throw new ApiError(403, 'account_disabled', 'This account is disabled. Ask an admin to enable it.');
  }
  await clearAccountFailures(db, email);
  await touchSignIn(db, user.id);
  return user;
}
