/**
 * Resumable uploads (tus 1.0.0 at /api/uploads) against the built server: pieces, an interrupted
 * PATCH resumed after a HEAD, termination, refusals at creation and at completion.
 * Protocol facts from "tus resumable upload protocol 1.0.0" (tus.io): POST with Upload-Length and
 * Upload-Metadata (comma-separated `key base64(value)`), 201 with Location; PATCH with
 * Upload-Offset and Content-Type application/offset+octet-stream, 204 with the new Upload-Offset;
 * HEAD answers Upload-Offset; DELETE (termination extension) answers 204.
 */
import { existsSync, statSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { cookieOf, download, expectNothingLeft, partialUploads, sampleBytes, send, sha256, signedIn, snapshot } from './captures-helpers';

let server: TestServer;
let engineer: Client;
let operator: Client;

beforeAll(async () => {
  process.env.QUADRILLE_DEMO_CAPTURES = '0';
  server = await startServer({ env: { QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: '8MiB' } });
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
  operator = await signedIn(server, 'operator@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
});

const tus = { 'tus-resumable': '1.0.0' };

function metadataHeader(metadata: Record<string, string>): string {
  return Object.entries(metadata)
    .map(([key, value]) => `${key} ${Buffer.from(value).toString('base64')}`)
    .join(',');
}

async function create(client: Client, length: number, metadata: Record<string, string>) {
  return send(client, 'POST', '/api/uploads', { headers: { ...tus, 'upload-length': String(length), 'upload-metadata': metadataHeader(metadata) } });
}

function patch(client: Client, location: string, offset: number, bytes: Uint8Array) {
  return send(client, 'PATCH', location, {
    body: bytes,
    headers: { ...tus, 'upload-offset': String(offset), 'content-type': 'application/offset+octet-stream' },
  });
}

function head(client: Client, location: string) {
  return send(client, 'HEAD', location, { headers: tus });
}

/** Polls `check` (every 20 ms, up to 30 s) until it holds; fails naming `what`. */
async function until(what: string, check: () => boolean): Promise<void> {
  for (let attempt = 0; !check(); attempt++) {
    if (attempt >= 1500) throw new Error(`timed out waiting for ${what}`);
    await new Promise((wake) => setTimeout(wake, 20));
  }
}

/** Sends the start of a PATCH body, then drops the connection, as a network failure would. */
function interruptedPatch(client: Client, location: string, offset: number, bytes: Uint8Array, sendBytes: number): Promise<void> {
  return new Promise((resolve, reject) => {
    const url = new URL(server.baseUrl + location);
    const request = httpRequest(url, {
      method: 'PATCH',
      headers: {
        ...tus,
        cookie: cookieOf(client),
        origin: server.baseUrl,
        'upload-offset': String(offset),
        'content-type': 'application/offset+octet-stream',
        'content-length': String(bytes.length),
      },
    });
    request.on('error', () => resolve());
    request.on('close', () => resolve());
    // Drop the connection once the server has written the sent part, not after a guessed pause.
    const partial = join(server.dataDir, 'uploads', location.split('/').pop()!);
    request.write(bytes.subarray(0, sendBytes), () => {
      void until(`${offset + sendBytes} bytes in ${partial}`, () => existsSync(partial) && statSync(partial).size >= offset + sendBytes).then(
        () => request.destroy(),
        (error) => {
          request.destroy();
          reject(error);
        },
      );
    });
  });
}

const description = { name: 'bench capture over tus', datatype: 'cf32_le', sampleRate: '4000000', centerFrequency: '2412000000', visibility: 'team', tags: 'tus,rev-a' };

describe('resumable upload', () => {
  it('uploads in pieces, survives an interrupted PATCH (HEAD, then continue) and creates the capture with the right sha256', async () => {
    const bytes = sampleBytes('cf32_le', 'complex', 300_000);
    const created = await create(engineer, bytes.length, description);
    expect(created.status, new TextDecoder().decode(created.bytes)).toBe(201);
    const location = created.headers.get('location')!;
    expect(location).toMatch(/^\/api\/uploads\/[0-9a-f]{32}$/);

    const first = await patch(engineer, location, 0, bytes.subarray(0, 1_000_000));
    expect(first.status).toBe(204);
    expect(first.headers.get('upload-offset')).toBe('1000000');

    await interruptedPatch(engineer, location, 1_000_000, bytes.subarray(1_000_000), 600_000);
    const resumed = await head(engineer, location);
    expect(resumed.status).toBe(200);
    const offset = Number(resumed.headers.get('upload-offset'));
    expect(offset).toBeGreaterThanOrEqual(1_000_000);
    expect(offset).toBeLessThanOrEqual(1_600_000);
    expect(resumed.headers.get('upload-length')).toBe(String(bytes.length));

    const rest = await patch(engineer, location, offset, bytes.subarray(offset));
    expect(rest.status).toBe(204);
    expect(rest.headers.get('upload-offset')).toBe(String(bytes.length));

    const result = await engineer.get(`${location}/capture`);
    expect(result.status, JSON.stringify(result.body)).toBe(200);
    expect(result.body).toMatchObject({ name: description.name, datatype: 'cf32_le', sampleRate: 4e6, centerFrequency: 2.412e9, visibility: 'team', tags: ['tus', 'rev-a'], sha256: sha256(bytes), sampleCount: 300_000 });
    expect(sha256(await download(engineer, result.body.id))).toBe(sha256(bytes));
    expect(partialUploads(server)).toEqual([]);
    expect((await head(engineer, location)).status).toBe(404);
  });

  it('takes the description from sigmfMeta', async () => {
    const bytes = sampleBytes('ri16_le', 'real-pair', 10_000);
    const meta = {
      global: { 'core:datatype': 'ri16_le', 'core:version': '1.2.0', 'core:sample_rate': 40e6, 'core:num_channels': 2 },
      captures: [{ 'core:sample_start': 0, 'core:frequency': 2.4013e9 }],
      annotations: [{ 'core:sample_start': 0, 'core:sample_count': 10, 'core:label': 'start' }],
    };
    const created = await create(engineer, bytes.length, { name: 'dual adc over tus', sigmfMeta: JSON.stringify(meta) });
    expect(created.status).toBe(201);
    const location = created.headers.get('location')!;
    expect((await patch(engineer, location, 0, bytes)).status).toBe(204);
    const result = await engineer.get(`${location}/capture`);
    expect(result.body).toMatchObject({ datatype: 'ri16_le', layout: 'real-pair', sampleRate: 40e6, centerFrequency: 2.4013e9, annotations: meta.annotations });
  });

  it('a terminated upload leaves nothing: no partial file, no row, no capture', async () => {
    const before = await snapshot(server);
    const bytes = sampleBytes('ci16_le', 'complex', 100_000);
    const created = await create(engineer, bytes.length, { ...description, datatype: 'ci16_le', name: 'cancelled' });
    const location = created.headers.get('location')!;
    expect((await patch(engineer, location, 0, bytes.subarray(0, 200_000))).status).toBe(204);
    expect(partialUploads(server).length).toBeGreaterThan(0);
    expect((await operator.request('DELETE', location, { headers: tus })).status).toBe(404);
    const terminated = await send(engineer, 'DELETE', location, { headers: tus });
    expect(terminated.status).toBe(204);
    expect((await head(engineer, location)).status).toBe(404);
    expect((await engineer.get(`${location}/capture`)).status).toBe(404);
    expect(partialUploads(server)).toEqual([]);
    expect(await server.db('capture_uploads').where({ id: location.split('/').pop() }).first()).toBeUndefined();
    await expectNothingLeft(server, before);
  });

  it('hides an upload from other users (404) and reports 202 while bytes are still due', async () => {
    const created = await create(engineer, 800, { ...description, name: 'half way' });
    const location = created.headers.get('location')!;
    expect((await head(operator, location)).status).toBe(404);
    expect((await patch(operator, location, 0, new Uint8Array(800))).status).toBe(404);
    expect((await operator.get(`${location}/capture`)).status).toBe(404);
    const pending = await engineer.get(`${location}/capture`);
    expect(pending.status).toBe(202);
    expect(pending.body).toEqual({ status: 'receiving', uploadLength: 800 });
  });
});

describe('refusals', () => {
  it.each([
    ['no name', { datatype: 'cf32_le', sampleRate: '1e6' }, 800, 400, 'name'],
    ['unknown datatype', { ...description, datatype: 'cf24_le' }, 800, 400, 'datatype'],
    ['sample rate 0', { ...description, sampleRate: '0' }, 800, 400, 'sampleRate'],
    ['infinite centre frequency', { ...description, centerFrequency: '-Infinity' }, 800, 400, 'centerFrequency'],
    ['length not whole samples', description, 801, 422, 'Upload-Length'],
    ['larger than one capture may be', description, 9 * 1024 * 1024, 413, 'Upload-Length'],
    ['bad sigmfMeta', { name: 'x', sigmfMeta: '{"global":{"core:version":"1.2.0"}}' }, 800, 422, 'sigmfMeta.global.core:datatype'],
    ['unknown metadata', { ...description, colour: 'red' }, 800, 400, 'colour'],
  ])('creation with %s is refused naming the field, keeping nothing', async (_label, metadata, length, status, field) => {
    const before = await snapshot(server);
    const partial = partialUploads(server);
    const response = await create(engineer, length, metadata as Record<string, string>);
    expect(response.status, JSON.stringify(response.body)).toBe(status);
    expect(response.headers.get('content-type')).toMatch(/json/);
    expect(response.body.error.field).toBe(field);
    expect(partialUploads(server)).toEqual(partial);
    await expectNothingLeft(server, before);
  });

  it('a body refused at completion (NaN sample) is reported by GET .../capture and leaves nothing', async () => {
    const before = await snapshot(server);
    const bytes = sampleBytes('cf32_le', 'complex', 1_000);
    new DataView(bytes.buffer, bytes.byteOffset).setFloat32(8 * 123, Number.POSITIVE_INFINITY, true);
    const location = (await create(engineer, bytes.length, { ...description, name: 'bad sample' })).headers.get('location')!;
    expect((await patch(engineer, location, 0, bytes)).status).toBe(204);
    const result = await engineer.get(`${location}/capture`);
    expect(result.status).toBe(422);
    expect(result.body.error.field).toBe('body');
    expect(result.body.error.message).toMatch(/sample 123 \(I\) is Infinity/);
    expect(partialUploads(server)).toEqual(expect.not.arrayContaining([expect.stringContaining(location.split('/').pop()!)]));
    await expectNothingLeft(server, before);
  });

  it('the same bytes again become a 409 duplicate offering the existing capture', async () => {
    const bytes = sampleBytes('ci8', 'complex', 5_000);
    const upload = async (name: string) => {
      const location = (await create(engineer, bytes.length, { name, datatype: 'ci8', sampleRate: '1e6' })).headers.get('location')!;
      expect((await patch(engineer, location, 0, bytes)).status).toBe(204);
      return engineer.get(`${location}/capture`);
    };
    const first = await upload('first copy');
    expect(first.status).toBe(200);
    const before = await snapshot(server);
    const second = await upload('second copy');
    expect(second.status).toBe(409);
    expect(second.body).toMatchObject({ error: { code: 'duplicate' }, capture: { id: first.body.id, name: 'first copy' } });
    await expectNothingLeft(server, before);
  });
});
