/**
 * The two run quotas checked when runs are asked for: compute seconds per user per UTC day, and
 * how many runs one user may have waiting or executing. Both refuse with 429 and a sentence that
 * says what was used and when it frees up.
 */
import type { Knex } from 'knex';
import { ApiError } from '../api/errors';
import { quotaOf } from '../quota';
import { maxPendingRuns } from './config';
import { utcDay } from './transitions';

/** Compute seconds (s) a user has used today (UTC). */
export async function computeSecondsToday(db: Knex, userId: string, when: Date = new Date()): Promise<number> {
  const row = (await db('compute_usage').where({ user_id: userId, day: utcDay(when) }).first('seconds')) as { seconds: number } | undefined;
  return Number(row?.seconds ?? 0);
}

/** Seconds (s) until the next UTC midnight, when the daily compute count starts again. */
export function secondsUntilUtcMidnight(when: Date = new Date()): number {
  const midnight = Date.UTC(when.getUTCFullYear(), when.getUTCMonth(), when.getUTCDate() + 1);
  return Math.ceil((midnight - when.getTime()) / 1000);
}

/** Throws 429 `quota_exceeded` when the user has no compute seconds left today. */
export async function assertComputeLeft(db: Knex, userId: string): Promise<void> {
  const [quota, used] = await Promise.all([quotaOf(db, userId), computeSecondsToday(db, userId)]);
  if (used < quota.computeSecondsPerDay) return;
  const wait = secondsUntilUtcMidnight();
  throw new ApiError(
    429,
    'quota_exceeded',
    `You have used ${Math.round(used)} of your ${quota.computeSecondsPerDay} compute seconds for today; new runs can start after 00:00 UTC (in ${Math.ceil(wait / 60)} min). Results already in the cache are still answered.`,
    null,
    { 'Retry-After': String(wait) },
  );
}

/** Throws 429 `too_many_runs` when `adding` more runs would pass the user's limit of waiting and executing runs. */
export async function assertRoomInQueue(db: Knex, userId: string, adding: number): Promise<void> {
  const limit = maxPendingRuns();
  const row = (await db('runs').where({ requested_by: userId }).whereIn('status', ['queued', 'running']).count({ count: '*' }).first()) as
    | { count: number | string }
    | undefined;
  const pending = Number(row?.count ?? 0);
  if (pending + adding <= limit) return;
  throw new ApiError(
    429,
    'too_many_runs',
    `You have ${pending} run(s) queued or running and may have at most ${limit} at once; wait for some to finish or cancel them before asking for ${adding} more.`,
  );
}
