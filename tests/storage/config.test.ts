import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  createObjectStore,
  LocalFileStore,
  readStorageConfig,
  S3Store,
  StorageConfigError,
} from '@/lib/server/storage';

describe('readStorageConfig', () => {
  it('defaults to local files under <data dir>/objects', () => {
    expect(readStorageConfig({})).toEqual({ kind: 'local', root: resolve('data', 'objects') });
    expect(readStorageConfig({ QUADRILLE_DATA_DIR: '/srv/quadrille' })).toEqual({
      kind: 'local',
      root: '/srv/quadrille/objects',
    });
  });

  it('reads the S3 settings', () => {
    expect(
      readStorageConfig({
        QUADRILLE_STORAGE: 's3',
        QUADRILLE_S3_BUCKET: 'saltmarsh-captures',
        QUADRILLE_S3_ENDPOINT: 'http://127.0.0.1:9000',
        QUADRILLE_S3_REGION: 'eu-west-2',
        QUADRILLE_S3_ACCESS_KEY_ID: 'id',
        QUADRILLE_S3_SECRET_ACCESS_KEY: 'secret',
        QUADRILLE_S3_FORCE_PATH_STYLE: 'true',
      }),
    ).toEqual({
      kind: 's3',
      bucket: 'saltmarsh-captures',
      endpoint: 'http://127.0.0.1:9000',
      region: 'eu-west-2',
      accessKeyId: 'id',
      secretAccessKey: 'secret',
      forcePathStyle: true,
    });
    const minimal = readStorageConfig({ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b' });
    expect(minimal).toMatchObject({ region: 'us-east-1', forcePathStyle: false, endpoint: undefined, accessKeyId: undefined });
  });

  it.each([
    [{ QUADRILLE_STORAGE: 'ftp' }, 'QUADRILLE_STORAGE'],
    [{ QUADRILLE_STORAGE: 's3' }, 'QUADRILLE_S3_BUCKET'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_ENDPOINT: 'localhost:9000' }, 'QUADRILLE_S3_ENDPOINT'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_ACCESS_KEY_ID: 'id' }, 'QUADRILLE_S3_SECRET_ACCESS_KEY'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_SECRET_ACCESS_KEY: 's' }, 'QUADRILLE_S3_ACCESS_KEY_ID'],
    [{ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_FORCE_PATH_STYLE: 'maybe' }, 'QUADRILLE_S3_FORCE_PATH_STYLE'],
  ])('names the bad variable in %j', (env, variable) => {
    const error = (() => {
      try {
        readStorageConfig(env);
      } catch (e) {
        return e;
      }
    })();
    expect(error).toBeInstanceOf(StorageConfigError);
    expect((error as StorageConfigError).variable).toBe(variable);
    expect((error as Error).message).toContain(variable);
  });
});

describe('createObjectStore', () => {
  it('builds the configured implementation', () => {
    const local = createObjectStore({ kind: 'local', root: '/tmp/q/objects' });
    expect(local).toBeInstanceOf(LocalFileStore);
    expect(local.kind).toBe('local');
    const s3 = createObjectStore(readStorageConfig({ QUADRILLE_STORAGE: 's3', QUADRILLE_S3_BUCKET: 'b', QUADRILLE_S3_ENDPOINT: 'http://127.0.0.1:1' }));
    expect(s3).toBeInstanceOf(S3Store);
    expect(s3.kind).toBe('s3');
  });
});
