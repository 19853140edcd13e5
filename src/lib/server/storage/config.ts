/**
 * Storage configuration, read from the environment:
 *
 *   QUADRILLE_STORAGE               `local` (default) or `s3`
 *   QUADRILLE_DATA_DIR              data folder (default `./data`); local objects go to `<dir>/objects`
 *   QUADRILLE_S3_BUCKET             bucket name (required for s3; the bucket must already exist)
 *   QUADRILLE_S3_ENDPOINT           base URL of an S3-compatible service; unset means AWS
 *   QUADRILLE_S3_REGION             region (default `us-east-1`, which most compatible services accept)
 *   QUADRILLE_S3_ACCESS_KEY_ID      access key; set both or neither (neither: the SDK's default
 *   QUADRILLE_S3_SECRET_ACCESS_KEY  credential chain, e.g. AWS_* variables or an instance role)
 *   QUADRILLE_S3_FORCE_PATH_STYLE   `true`/`false` (default false); true for most self-hosted services
 */
import { resolve } from 'node:path';
import { StorageConfigError } from './errors';
import { LocalFileStore } from './local-file-store';
import { createS3Client, S3Store } from './s3-store';
import type { ObjectStore } from './types';

/** Where objects live, as parsed from the environment. */
export type StorageConfig =
  | { kind: 'local'; root: string }
  | {
      kind: 's3';
      bucket: string;
      region: string;
      endpoint?: string;
      accessKeyId?: string;
      secretAccessKey?: string;
      forcePathStyle: boolean;
    };

type Environment = Record<string, string | undefined>;

/** Parses the QUADRILLE_STORAGE / QUADRILLE_S3_* variables; throws StorageConfigError naming the variable. */
export function readStorageConfig(env: Environment = process.env): StorageConfig {
  const kind = (env.QUADRILLE_STORAGE ?? '').trim() || 'local';
  if (kind === 'local') {
    const dataDir = (env.QUADRILLE_DATA_DIR ?? '').trim() || 'data';
    return { kind: 'local', root: resolve(dataDir, 'objects') };
  }
  if (kind !== 's3') throw new StorageConfigError('QUADRILLE_STORAGE', `must be "local" or "s3", got "${kind}"`);

  const bucket = (env.QUADRILLE_S3_BUCKET ?? '').trim();
  if (!bucket) throw new StorageConfigError('QUADRILLE_S3_BUCKET', 'is required when QUADRILLE_STORAGE=s3');
  const endpoint = (env.QUADRILLE_S3_ENDPOINT ?? '').trim() || undefined;
  if (endpoint !== undefined) {
    let url: URL | undefined;
    try {
      url = new URL(endpoint);
    } catch {
      url = undefined;
    }
    if (!url || (url.protocol !== 'http:' && url.protocol !== 'https:')) {
      throw new StorageConfigError('QUADRILLE_S3_ENDPOINT', `must be an http(s) URL, got "${endpoint}"`);
    }
  }
  const accessKeyId = (env.QUADRILLE_S3_ACCESS_KEY_ID ?? '').trim() || undefined;
  const secretAccessKey = (env.QUADRILLE_S3_SECRET_ACCESS_KEY ?? '').trim() || undefined;
  if ((accessKeyId === undefined) !== (secretAccessKey === undefined)) {
    const missing = accessKeyId === undefined ? 'QUADRILLE_S3_ACCESS_KEY_ID' : 'QUADRILLE_S3_SECRET_ACCESS_KEY';
    throw new StorageConfigError(missing, 'must be set together with its partner key, or both left unset');
  }
  return {
    kind: 's3',
    bucket,
    region: (env.QUADRILLE_S3_REGION ?? '').trim() || 'us-east-1',
    endpoint,
    accessKeyId,
    secretAccessKey,
    forcePathStyle: parseFlag(env.QUADRILLE_S3_FORCE_PATH_STYLE, 'QUADRILLE_S3_FORCE_PATH_STYLE'),
  };
}

/** Builds the configured store; without an argument it reads the environment. */
export function createObjectStore(config: StorageConfig = readStorageConfig()): ObjectStore {
  if (config.kind === 'local') return new LocalFileStore(config.root);
  return new S3Store({ client: createS3Client(config), bucket: config.bucket });
}

function parseFlag(value: string | undefined, variable: string): boolean {
  const text = (value ?? '').trim().toLowerCase();
  if (text === '' || text === 'false' || text === '0' || text === 'no') return false;
  if (text === 'true' || text === '1' || text === 'yes') return true;
  throw new StorageConfigError(variable, `must be true or false, got "${value}"`);
}
