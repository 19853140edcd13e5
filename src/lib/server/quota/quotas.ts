/**
 * Per-user quotas: the configured defaults overlaid with a user's overrides (table user_quotas),
 * storage used, and the byte allowance of the next capture.
 */
import type { Knex } from 'knex';
import { ApiError } from '../api/errors';
import { defaultQuota, type Quota } from './config';
import type { StorageUsage } from '@/contracts/capture';

interface UserQuotaRow {
  user_id: string;
  storage_bytes: number | null;
  largest_capture_bytes: number | null;
  compute_seconds_per_day: number | null;
  concurrent_runs: number | null;
  updated_at: string;
}

/** The quota in force for a user: overrides where set, defaults elsewhere. */
export async function quotaOf(db: Knex, userId: string): Promise<Quota> {
  return (await quotasOf(db, [userId])).get(userId)!;
}

/** The quotas of several users in one query, by user id. */
export async function quotasOf(db: Knex, userIds: string[]): Promise<Map<string, Quota>> {
  const defaults = defaultQuota();
  const ids = [...new Set(userIds)];
  const rows = ids.length > 0 ? await db<UserQuotaRow>('user_quotas').whereIn('user_id', ids) : [];
  const byUser = new Map(rows.map((row) => [row.user_id, row]));
  return new Map(
    ids.map((id) => {
      const row = byUser.get(id);
      if (!row) return [id, defaults];
      return [
        id,
        {
          storageBytes: row.storage_bytes === null ? defaults.storageBytes : Number(row.storage_bytes),
          largestCaptureBytes: row.largest_capture_bytes === null ? defaults.largestCaptureBytes : Number(row.largest_capture_bytes),
          computeSecondsPerDay: row.compute_seconds_per_day ?? defaults.computeSecondsPerDay,
          concurrentRuns: row.concurrent_runs ?? defaults.concurrentRuns,
        },
      ];
    }),
  );
}

/** Overrides some of a user's quota figures; null puts a figure back to the default. */
export async function setUserQuota(db: Knex, userId: string, changes: Partial<{ [K in keyof Quota]: number | null }>): Promise<void> {
  const row = {
    user_id: userId,
    storage_bytes: changes.storageBytes,
    largest_capture_bytes: changes.largestCaptureBytes,
    compute_seconds_per_day: changes.computeSecondsPerDay,
    concurrent_runs: changes.concurrentRuns,
    updated_at: new Date().toISOString(),
  };
  const defined = Object.fromEntries(Object.entries(row).filter(([, value]) => value !== undefined));
  await db('user_quotas').insert(defined).onConflict('user_id').merge();
}

/** Bytes and number of the captures a user owns. */
export async function storageUsed(db: Knex, userId: string): Promise<{ storedBytes: number; captureCount: number }> {
  const row = await db('captures')
    .where({ owner_id: userId })
    .first(db.raw('coalesce(sum(byte_size), 0) as bytes'), db.raw('count(*) as count'));
  return { storedBytes: Number(row?.bytes ?? 0), captureCount: Number(row?.count ?? 0) };
}

/** What the captures list shows beside the table (the capture contract's). */
export type { StorageUsage };

/** Storage used against the quota. */
export async function storageUsage(db: Knex, userId: string): Promise<StorageUsage> {
  const [quota, used] = await Promise.all([quotaOf(db, userId), storageUsed(db, userId)]);
  return { ...used, quotaBytes: quota.storageBytes, largestCaptureBytes: quota.largestCaptureBytes };
}

/**
 * Largest number of bytes the next capture may have (bytes), and which limit sets it: the
 * largest-capture quota or the storage left.
 */
export interface Allowance {
  maxBytes: number;
  limitedBy: 'largest_capture' | 'storage';
  quota: Quota;
  storedBytes: number;
}

/** The byte allowance of a user's next capture. */
export async function captureAllowance(db: Knex, userId: string): Promise<Allowance> {
  const [quota, used] = await Promise.all([quotaOf(db, userId), storageUsed(db, userId)]);
  const left = Math.max(0, quota.storageBytes - used.storedBytes);
  return quota.largestCaptureBytes <= left
    ? { maxBytes: quota.largestCaptureBytes, limitedBy: 'largest_capture', quota, storedBytes: used.storedBytes }
    : { maxBytes: left, limitedBy: 'storage', quota, storedBytes: used.storedBytes };
}

/** 413 for a capture of `bytes` that passes the allowance; `field` names the size input. */
export function quotaError(allowance: Allowance, bytes: number | null, field: string | null = null): ApiError {
  const size = bytes === null ? 'This capture' : `A capture of ${bytes} bytes`;
  if (allowance.limitedBy === 'largest_capture') {
    return new ApiError(413, 'capture_too_large', `${size} is larger than the largest capture allowed, ${allowance.quota.largestCaptureBytes} bytes.`, field);
  }
  return new ApiError(
    413,
    'quota_exceeded',
    `${size} does not fit the storage quota: ${allowance.storedBytes} of ${allowance.quota.storageBytes} bytes are used.`,
    field,
  );
}

/** Throws the 413 unless a capture of `bytes` fits the allowance. */
export function assertFits(allowance: Allowance, bytes: number, field: string | null = null): void {
  if (bytes > allowance.maxBytes) throw quotaError(allowance, bytes, field);
}
