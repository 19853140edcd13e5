/**
 * Sign-in rate limit: failed attempts are counted in a sliding window per account e-mail (so one
 * account cannot be guessed at) and per client address (so one client cannot sweep many accounts).
 * Stored in the database so the limit holds across restarts and server processes.
 */
import type { Knex } from 'knex';
import { rateLimited } from '../api/errors';
import { normalizeEmail } from '../users';

/** Window over which failures count (ms). */
export const failureWindowMs = 15 * 60 * 1000;
/** Failures per account within the window before sign-in is refused. */
export const accountFailureLimit = 5;
/** Failures per client address within the window before sign-in is refused. */
export const addressFailureLimit = 20;

/**
 * Seconds until the `limit`-th most recent failure leaves the window, or 0 when fewer than
 * `limit` failures are inside it.
 */
async function waitFor(db: Knex, column: 'account_email' | 'address', key: string, limit: number, now: number): Promise<number> {
  const since = new Date(now - failureWindowMs).toISOString();
  const row = await db('sign_in_failures')
    .where(column, key)
    .where('failed_at', '>', since)
    .orderBy('failed_at', 'desc')
    .offset(limit - 1)
    .first<{ failed_at: string } | undefined>('failed_at');
  if (!row) return 0;
  return (new Date(row.failed_at).getTime() + failureWindowMs - now) / 1000;
}

/** Throws 429 with Retry-After when the account or the address has failed too often. */
export async function assertSignInAllowed(db: Knex, email: string, address: string, now = Date.now()): Promise<void> {
  const wait = Math.max(
    await waitFor(db, 'account_email', normalizeEmail(email), accountFailureLimit, now),
    await waitFor(db, 'address', address, addressFailureLimit, now),
  );
  if (wait > 0) throw rateLimited(wait);
}

/** Counts a failed attempt and forgets failures that have left the window. */
export async function recordSignInFailure(db: Knex, email: string, address: string, now = Date.now()): Promise<void> {
  await db('sign_in_failures').insert({
    account_email: normalizeEmail(email).slice(0, 254),
    address: address.slice(0, 64),
    failed_at: new Date(now).toISOString(),
  });
  await db('sign_in_failures').where('failed_at', '<=', new Date(now - failureWindowMs).toISOString()).delete();
}

/** Clears an account's failures after it signed in, so earlier typos do not linger. */
export async function clearAccountFailures(db: Knex, email: string): Promise<void> {
  await db('sign_in_failures').where('account_email', normalizeEmail(email)).delete();
}
