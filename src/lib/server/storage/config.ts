/**
 * Storage configuration: the QUADRILLE_STORAGE / QUADRILLE_S3_* variables of the one configuration
 * (src/lib/config/schema.ts checks them), shaped for the store. Local objects go to
 * `<QUADRILLE_DATA_DIR>/objects`.
 */
import { join } from 'node:path';
import { config, ConfigError, parseConfig, type Config } from '../../config';
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

/**
 * The storage settings of `env` (default: the process configuration, read once); throws
 * StorageConfigError naming the variable.
 */
export function readStorageConfig(env?: Environment): StorageConfig {
  let settings: Config;
  try {
    settings = env ? parseConfig(env) : config();
  } catch (error) {
    if (error instanceof ConfigError) {
      const first = error.problems[0]!;
      throw new StorageConfigError(first.variable, first.problem);
    }
    throw error;
  }
  return storageConfigOf(settings);
}

/** The storage part of a parsed configuration; `dataDir` overrides where local objects go. */
export function storageConfigOf(settings: Config, dataDir: string = settings.QUADRILLE_DATA_DIR): StorageConfig {
  if (settings.QUADRILLE_STORAGE === 'local') return { kind: 'local', root: join(dataDir, 'objects') };
  return {
    kind: 's3',
    // The schema requires a bucket with QUADRILLE_STORAGE=s3.
    bucket: settings.QUADRILLE_S3_BUCKET!,
    region: settings.QUADRILLE_S3_REGION,
    endpoint: settings.QUADRILLE_S3_ENDPOINT,
    accessKeyId: settings.QUADRILLE_S3_ACCESS_KEY_ID,
    secretAccessKey: settings.QUADRILLE_S3_SECRET_ACCESS_KEY,
    forcePathStyle: settings.QUADRILLE_S3_FORCE_PATH_STYLE,
  };
}

/** Builds the configured store; without an argument it reads the environment. */
export function createObjectStore(config: StorageConfig = readStorageConfig()): ObjectStore {
  if (config.kind === 'local') return new LocalFileStore(config.root);
  return new S3Store({ client: createS3Client(config), bucket: config.bucket });
}
