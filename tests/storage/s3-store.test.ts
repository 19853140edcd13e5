import { randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import S3rver from 's3rver';
import { describe, expect, it } from 'vitest';
import { createS3Client, S3Store } from '@/lib/server/storage';
import { chunked, objectStoreContract } from './contract';
import { fixS3rverRanges } from './s3rver-ranges';

const BUCKET = 'quadrille-test';

/** Starts s3rver on a free loopback port over a temp folder, with the SDK client pointed at it. */
async function startFakeS3() {
  fixS3rverRanges();
  const directory = await mkdtemp(join(tmpdir(), 'quadrille-s3rver-'));
  const server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    silent: true,
    directory,
    configureBuckets: [{ name: BUCKET }],
  });
  const { port } = await server.run();
  const client = createS3Client({
    region: 'us-east-1',
    endpoint: `http://127.0.0.1:${port}`,
    // s3rver's fixed development credentials.
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    forcePathStyle: true,
  });
  // Record which S3 operations were sent, to check the store's clean-up calls.
  const sent: string[] = [];
  client.middlewareStack.add(
    (next, context) => (args) => {
      sent.push(String(context.commandName));
      return next(args);
    },
    { step: 'initialize', name: 'recordCommands' },
  );
  return {
    directory,
    client,
    sent,
    async close() {
      client.destroy();
      await server.close();
      await rm(directory, { recursive: true, force: true });
    },
  };
}

objectStoreContract('S3Store against s3rver', async () => {
  const fake = await startFakeS3();
  return {
    store: new S3Store({ client: fake.client, bucket: BUCKET }),
    // s3rver answers AbortMultipartUpload with 405 and keeps the part files on its disk, so
    // there is nothing honest to list here; the test below checks that the store sends the abort.
    strays: async () => [],
    close: fake.close,
  };
});

describe('S3Store multipart clean-up', () => {
  it('aborts the multipart upload when the source fails after parts were sent', async () => {
    const fake = await startFakeS3();
    try {
      const store = new S3Store({ client: fake.client, bucket: BUCKET });
      async function* failing() {
        yield randomBytes(17 * 1024 * 1024);
        // Fail only once a part is on its way, as a connection dropping mid-upload would.
        while (!fake.sent.includes('UploadPartCommand')) await new Promise((resolve) => setTimeout(resolve, 5));
        throw new Error('source broke');
      }
      await expect(store.put('mp/broken', failing())).rejects.toThrow('source broke');
      expect(fake.sent).toContain('CreateMultipartUploadCommand');
      expect(fake.sent).toContain('UploadPartCommand');
      expect(fake.sent).toContain('AbortMultipartUploadCommand');
      expect(fake.sent).not.toContain('CompleteMultipartUploadCommand');
      expect(await store.exists('mp/broken')).toBe(false);
    } finally {
      await fake.close();
    }
  });

  it('sends a small object as one PutObject', async () => {
    const fake = await startFakeS3();
    try {
      const store = new S3Store({ client: fake.client, bucket: BUCKET });
      await store.put('mp/small', chunked(randomBytes(3000)));
      expect(fake.sent).toEqual(['PutObjectCommand']);
    } finally {
      await fake.close();
    }
  });
});
