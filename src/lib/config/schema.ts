/**
 * THE list of Quadrille's environment variables: each with its check, default, unit and a
 * `.describe()` text. The README's configuration tables are checked against it
 * (tests/unit/config.test.ts); adding a variable means a line here and a row there.
 */
import { availableParallelism } from 'node:os';
import { z } from 'zod';
import { byteSize, flag, httpUrl, list, looseFlag, oneOf, path, realNumber, text, wholeNumber, type SettingDoc } from './fields';

const GiB = 1024 ** 3;

/** Unit and default of every variable, as the README shows them. */
export const settingDocs: Record<string, SettingDoc> = {};

function doc<S extends z.ZodTypeAny>(name: string, schema: S, unit: string, fallback: string, about: string): S {
  settingDocs[name] = { unit, default: fallback };
  return schema.describe(about) as S;
}

const fields = {
  // Server and data
  QUADRILLE_DATA_DIR: doc('QUADRILLE_DATA_DIR', path('data'), 'path', './data', 'folder of the SQLite database and stored sample files'),
  QUADRILLE_DEMO: doc('QUADRILLE_DEMO', flag(true), 'flag', 'on', 'seed the demo accounts and data at start (0 skips it)'),
  QUADRILLE_DEMO_CAPTURES: doc('QUADRILLE_DEMO_CAPTURES', flag(true), 'flag', 'on', 'synthesize the four demo captures with the demo (0 skips it)'),
  PORT: doc('PORT', wholeNumber(4321, 1, 65535), 'port', '4321', 'TCP port the server listens on'),
  HOST: doc('HOST', text('localhost'), 'address', 'localhost', 'address the server listens on'),
  QUADRILLE_ALLOWED_HOSTS: doc('QUADRILLE_ALLOWED_HOSTS', list(), 'host names', '', 'extra host names the server is reached by, comma separated (read at build time)'),
  NODE_ENV: doc('NODE_ENV', text(), 'text', '', '`production` marks the session cookie Secure'),
  SERVER_CERT_PATH: doc('SERVER_CERT_PATH', text(), 'path', '', 'PEM certificate: with SERVER_KEY_PATH the server speaks HTTPS'),
  SERVER_KEY_PATH: doc('SERVER_KEY_PATH', text(), 'path', '', 'PEM private key of SERVER_CERT_PATH'),
  QUADRILLE_REQUEST_TIMEOUT_SECONDS: doc('QUADRILLE_REQUEST_TIMEOUT_SECONDS', realNumber(4 * 3600, 0, true, 'seconds'), 's', '14400', 'time one request may take to arrive; 0 = no limit'),

  // Object storage
  QUADRILLE_STORAGE: doc('QUADRILLE_STORAGE', oneOf('local', ['local', 's3'] as const), 'word', 'local', 'where sample data lives: local disk or an S3-compatible bucket'),
  QUADRILLE_S3_BUCKET: doc('QUADRILLE_S3_BUCKET', text(), 'text', '', 'bucket name (required with QUADRILLE_STORAGE=s3; must exist)'),
  QUADRILLE_S3_ENDPOINT: doc('QUADRILLE_S3_ENDPOINT', httpUrl(), 'URL', 'AWS', 'base URL of an S3-compatible service; unset means AWS'),
  QUADRILLE_S3_REGION: doc('QUADRILLE_S3_REGION', text('us-east-1'), 'text', 'us-east-1', 'bucket region'),
  QUADRILLE_S3_ACCESS_KEY_ID: doc('QUADRILLE_S3_ACCESS_KEY_ID', text(), 'text', 'SDK default chain', 'access key; set both keys or neither (then the SDK default chain)'),
  QUADRILLE_S3_SECRET_ACCESS_KEY: doc('QUADRILLE_S3_SECRET_ACCESS_KEY', text(), 'text', 'SDK default chain', 'secret of QUADRILLE_S3_ACCESS_KEY_ID'),
  QUADRILLE_S3_FORCE_PATH_STYLE: doc('QUADRILLE_S3_FORCE_PATH_STYLE', flag(false), 'flag', 'false', 'path-style bucket URLs (most self-hosted services)'),

  // Quotas and uploads
  QUADRILLE_QUOTA_STORAGE_BYTES: doc('QUADRILLE_QUOTA_STORAGE_BYTES', byteSize(32 * GiB), 'bytes', '32GiB', 'capture bytes each user may store'),
  QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: doc('QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES', byteSize(8 * GiB), 'bytes', '8GiB', 'largest single capture'),
  QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY: doc('QUADRILLE_QUOTA_COMPUTE_SECONDS_PER_DAY', wholeNumber(7200, 0), 's', '7200', 'processing time per user per day'),
  QUADRILLE_QUOTA_CONCURRENT_RUNS: doc('QUADRILLE_QUOTA_CONCURRENT_RUNS', wholeNumber(2, 0), 'count', '2', 'runs per user at once'),
  QUADRILLE_UPLOAD_EXPIRY_HOURS: doc('QUADRILLE_UPLOAD_EXPIRY_HOURS', realNumber(24, 0, false, 'hours'), 'h', '24', 'unfinished resumable uploads are deleted this long after they started'),

  // Runs
  QUADRILLE_RUN_CONCURRENCY: doc('QUADRILLE_RUN_CONCURRENCY', wholeNumber(() => Math.max(1, availableParallelism() - 1), 1), 'count', 'cores - 1 (at least 1)', 'runs executing at once in this server'),
  QUADRILLE_RUN_MAX_PENDING: doc('QUADRILLE_RUN_MAX_PENDING', wholeNumber(100, 1), 'count', '100', 'queued + running runs one user may have (then 429)'),
  QUADRILLE_RUN_PROGRESS_MS: doc('QUADRILLE_RUN_PROGRESS_MS', wholeNumber(200, 10), 'ms', '200', 'least time between two progress updates of a run'),
  QUADRILLE_RUN_CANCEL_GRACE_MS: doc('QUADRILLE_RUN_CANCEL_GRACE_MS', wholeNumber(1500, 0), 'ms', '1500', 'time a cancelled worker gets to stop before it is terminated'),
  QUADRILLE_RUN_SHUTDOWN_GRACE_MS: doc('QUADRILLE_RUN_SHUTDOWN_GRACE_MS', wholeNumber(10_000, 0), 'ms', '10000', 'time executing runs get to finish on SIGTERM/SIGINT before they are stopped and put back in the queue'),
  QUADRILLE_RUN_WORKER_HEAP_MB: doc('QUADRILLE_RUN_WORKER_HEAP_MB', wholeNumber(1536, 64), 'MiB', '1536', 'old-generation heap cap of one run worker thread'),
  QUADRILLE_RUN_NICE: doc('QUADRILLE_RUN_NICE', wholeNumber(19, 0, 19), 'nice', '19', 'nice value of run worker threads (Linux)'),
  QUADRILLE_SSE_HEARTBEAT_MS: doc('QUADRILLE_SSE_HEARTBEAT_MS', wholeNumber(15_000, 100), 'ms', '15000', 'interval of the keep-alive comment on event streams'),
  QUADRILLE_RUN_WORKER: doc('QUADRILLE_RUN_WORKER', text(), 'path', 'built-in', 'worker entry file, overriding the built-in lookup'),

  // Command line
  QUADRILLE_TIMING: doc('QUADRILLE_TIMING', looseFlag(), 'flag', 'off', 'the CLI prints start-up and run timings to stderr'),
  QUADRILLE_DEBUG: doc('QUADRILLE_DEBUG', looseFlag(), 'flag', 'off', 'the CLI prints stack traces with source maps'),
  QUADRILLE_CLI_NO_BUNDLE: doc('QUADRILLE_CLI_NO_BUNDLE', looseFlag(), 'flag', 'off', 'the CLI runs from source through tsx instead of a cached bundle'),
};

/** Names of every variable Quadrille reads. */
export type SettingName = keyof typeof fields;

/** Each variable on its own (for readers that need one, like the CLI, without the rest). */
export const settingSchemas = fields;

/** The whole environment, with the rules that tie variables together. */
export const configSchema = z.object(fields).superRefine((config, ctx) => {
  const problem = (variable: SettingName, message: string) => ctx.addIssue({ code: z.ZodIssueCode.custom, path: [variable], message });
  if (config.QUADRILLE_STORAGE === 's3') {
    if (!config.QUADRILLE_S3_BUCKET) problem('QUADRILLE_S3_BUCKET', 'is required when QUADRILLE_STORAGE=s3');
    if (!config.QUADRILLE_S3_ACCESS_KEY_ID !== !config.QUADRILLE_S3_SECRET_ACCESS_KEY) {
      const missing = config.QUADRILLE_S3_ACCESS_KEY_ID ? 'QUADRILLE_S3_SECRET_ACCESS_KEY' : 'QUADRILLE_S3_ACCESS_KEY_ID';
      problem(missing, 'must be set together with its partner key, or both left unset');
    }
  }
  if (!config.SERVER_CERT_PATH !== !config.SERVER_KEY_PATH) {
    problem(config.SERVER_CERT_PATH ? 'SERVER_KEY_PATH' : 'SERVER_CERT_PATH', 'must be set together with its partner (certificate and key), or both left unset');
  }
});

/** The parsed configuration: one typed value per variable. */
export type Config = z.output<typeof configSchema>;
