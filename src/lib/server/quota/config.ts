/**
 * The default quota, from the QUADRILLE_QUOTA_* variables of the configuration (src/lib/config).
 * Per-user overrides live in the `user_quotas` table (./quotas.ts).
 */
import { config } from '../../config';

/** The quota of one user; every figure a whole number. */
export interface Quota {
  /** Bytes of stored captures allowed in total. */
  storageBytes: number;
  /** Bytes allowed for one capture. */
  largestCaptureBytes: number;
  /** Processing time per day (s). */
  computeSecondsPerDay: number;
  /** Runs at the same time. */
  concurrentRuns: number;
}

/** The configured default quota (QUADRILLE_QUOTA_* variables, or the built-in defaults). */
export function defaultQuota(): Quota {
  const settings = config();
  return {
    storageBytes: settings.QUADRILLE_QUOTA_STORAGE_BYTES,
    largestCaptureBytes: settings.QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES,
    computeSecondsPerDay: settings.QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY,
    concurrentRuns: settings.QUADRILLE_QUOTA_CONCURRENT_RUNS,
  };
}
