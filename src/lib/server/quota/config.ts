/**
 * Quota defaults, read from the environment once per call (cheap) so tests and deployments can
 * set them per process:
 *
 *   QUADRILLE_QUOTA_STORAGE_BYTES             bytes of captures a user may store (default 32 GiB)
 *   QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES     largest single capture in bytes (default 8 GiB)
 *   QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY   run time per user per day in s (default 7200)
 *   QUADRILLE_QUOTA_CONCURRENT_RUNS           runs a user may have going at once (default 2)
 *
 * Byte values accept a plain count or a binary suffix (`512MiB`, `8GiB`).
 */

const env = process.env;

const GiB = 1024 ** 3;

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

/** Error for a quota variable that does not parse; names the variable. */
export class QuotaConfigError extends Error {
  constructor(readonly variable: string, problem: string) {
    super(`${variable} ${problem}`);
    this.name = 'QuotaConfigError';
  }
}

const suffixes: Record<string, number> = { '': 1, b: 1, kib: 1024, mib: 1024 ** 2, gib: GiB, tib: 1024 ** 4 };

/** Parses a byte count such as `1073741824` or `8GiB`; throws QuotaConfigError naming `variable`. */
export function parseByteCount(text: string, variable: string): number {
  const match = /^\s*(\d+(?:\.\d+)?)\s*([a-z]*)\s*$/i.exec(text);
  const factor = match ? suffixes[match[2]!.toLowerCase()] : undefined;
  const value = match && factor !== undefined ? Math.floor(Number(match[1]) * factor) : NaN;
  if (!Number.isSafeInteger(value) || value < 0) {
    throw new QuotaConfigError(variable, `must be a byte count such as 1073741824 or 8GiB, got "${text}"`);
  }
  return value;
}

function readBytes(variable: string, fallback: number): number {
  const text = (env[variable] ?? '').trim();
  return text ? parseByteCount(text, variable) : fallback;
}

function readCount(variable: string, fallback: number): number {
  const text = (env[variable] ?? '').trim();
  if (!text) return fallback;
  const value = Number(text);
  if (!Number.isSafeInteger(value) || value < 0) throw new QuotaConfigError(variable, `must be a whole number >= 0, got "${text}"`);
  return value;
}

/** The configured default quota (QUADRILLE_QUOTA_* variables, or the built-in defaults). */
export function defaultQuota(): Quota {
  return {
    storageBytes: readBytes('QUADRILLE_QUOTA_STORAGE_BYTES', 32 * GiB),
    largestCaptureBytes: readBytes('QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES', 8 * GiB),
    computeSecondsPerDay: readCount('QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY', 7200),
    concurrentRuns: readCount('QUADRILLE_QUOTA_CONCURRENT_RUNS', 2),
  };
}
