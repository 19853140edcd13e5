/**
 * The captures API with QUADRILLE_STORAGE=s3, against a fake S3 server (s3rver) started here:
 * a multipart-sized upload round-trips, ranges work, a duplicate and a delete leave no object.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import S3rver from 's3rver';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createS3Client } from '@/lib/server/storage';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { fixS3rverRanges } from '../storage/s3rver-ranges';
import { download, sampleBytes, send, sha256, signedIn, storedObjects, upload } from './captures-helpers';

const BUCKET = 'quadrille-captures';
let fake: S3rver;
let fakeFolder: string;
let server: TestServer;
let engineer: Client;
let s3: ReturnType<typeof createS3Client>;

async function bucketKeys(): Promise<string[]> {
  const listed = await s3.send(new ListObjectsV2Command({ Bucket: BUCKET }));
  return (listed.Contents ?? []).map((object) => object.Key!).sort();
}

beforeAll(async () => {
  fixS3rverRanges();
  fakeFolder = await mkdtemp(join(tmpdir(), 'quadrille-s3rver-api-'));
  fake = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory: fakeFolder, configureBuckets: [{ name: BUCKET }] });
  const { port } = await fake.run();
  const env = {
    QUADRILLE_STORAGE: 's3',
    QUADRILLE_S3_BUCKET: BUCKET,
    QUADRILLE_S3_ENDPOINT: `http://127.0.0.1:${port}`,
    // s3rver's fixed development credentials.
    QUADRILLE_S3_ACCESS_KEY_ID: 'S3RVER',
    QUADRILLE_S3_SECRET_ACCESS_KEY: 'S3RVER',
    QUADRILLE_S3_FORCE_PATH_STYLE: 'true',
  };
  // The demo seed runs in this process: keep it (and anything else here) on the same storage.
  Object.assign(process.env, env, { QUADRILLE_DEMO_CAPTURES: '0' });
  s3 = createS3Client({ region: 'us-east-1', endpoint: env.QUADRILLE_S3_ENDPOINT, accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER', forcePathStyle: true });
  server = await startServer({ env });
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
  s3?.destroy();
  await fake?.close();
  await rm(fakeFolder, { recursive: true, force: true });
});

describe('captures on S3-compatible storage', () => {
  it('stores a multipart-sized upload in the bucket, serves it whole and in ranges, deletes it', async () => {
    // 12 MiB: more than one 8 MiB part, so the multipart path is the one exercised.
    const bytes = sampleBytes('ci16_le', 'complex', 3 * 1024 * 1024);
    const created = await upload(engineer, bytes, { name: 'on s3', datatype: 'ci16_le', sample_rate: 20e6 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const id = created.body.id;
    expect(created.body.sha256).toBe(sha256(bytes));
    expect(await bucketKeys()).toEqual([`captures/${id}`]);
    expect(storedObjects(server)).toEqual([]);
    expect(sha256(await download(engineer, id))).toBe(sha256(bytes));
    const range = await send(engineer, 'GET', `/api/captures/${id}/data`, { headers: { range: 'bytes=1000-1999' } });
    expect(range.status).toBe(206);
    expect(range.headers.get('content-range')).toBe(`bytes 1000-1999/${bytes.length}`);
    expect(Buffer.from(range.bytes).equals(Buffer.from(bytes.subarray(1000, 2000)))).toBe(true);
    expect((await send(engineer, 'GET', `/api/captures/${id}/data`, { headers: { range: `bytes=${bytes.length}-` } })).status).toBe(416);

    const duplicate = await upload(engineer, bytes, { name: 'again', datatype: 'ci16_le', sample_rate: 20e6 });
    expect(duplicate.status).toBe(409);
    expect(await bucketKeys()).toEqual([`captures/${id}`]);

    expect((await engineer.request('DELETE', `/api/captures/${id}`)).status).toBe(204);
    expect(await bucketKeys()).toEqual([]);
  });

  it('leaves no object behind when the body turns out bad half-way', async () => {
    const bytes = sampleBytes('cf32_le', 'complex', 2 * 1024 * 1024);
    new DataView(bytes.buffer, bytes.byteOffset).setFloat32(8 * 1_500_000, Number.NaN, true);
    const refused = await upload(engineer, bytes, { name: 'bad on s3', datatype: 'cf32_le', sample_rate: 20e6 });
    expect(refused.status).toBe(422);
    expect(refused.body.error.field).toBe('body');
    expect(await bucketKeys()).toEqual([]);
  });
});
