/**
 * What leaves the built server compressed: static assets (brotli or gzip copies made at build
 * time) and JSON answers above a few kB, each only for a client that accepts the coding; never
 * an event stream or sample data. Bodies are read without decoding, so the test sees the bytes
 * on the wire, and checked against the built files and the plain answers.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import http from 'node:http';
import { join, resolve } from 'node:path';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client } from '../helpers/client';
import { demoPassword } from '@/lib/server/seed';

let server: TestServer;
let engineer: Client;

beforeAll(async () => {
  server = await startServer();
  engineer = new Client(server.baseUrl);
  expect((await engineer.signIn('engineer@saltmarsh.test', demoPassword)).status).toBe(200);
});
afterAll(async () => {
  await server?.stop();
});

interface RawAnswer {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
}

/** GET without any decoding; `stopAfterHeaders` ends the request once the headers arrived (event streams). */
function rawGet(path: string, headers: Record<string, string>, stopAfterHeaders = false): Promise<RawAnswer> {
  const cookie = [...engineer.cookies].map(([name, value]) => `${name}=${value}`).join('; ');
  return new Promise((done, fail) => {
    const request = http.get(server.baseUrl + path, { headers: { cookie, ...headers } }, (response) => {
      if (stopAfterHeaders) {
        done({ status: response.statusCode!, headers: response.headers, body: Buffer.alloc(0) });
        request.destroy();
        return;
      }
      const chunks: Buffer[] = [];
      response.on('data', (chunk: Buffer) => chunks.push(chunk));
      response.on('end', () => done({ status: response.statusCode!, headers: response.headers, body: Buffer.concat(chunks) }));
      response.on('error', fail);
    });
    request.on('error', (error) => (stopAfterHeaders ? undefined : fail(error)));
  });
}

function decode(answer: RawAnswer): Buffer {
  const coding = answer.headers['content-encoding'];
  if (coding === 'br') return brotliDecompressSync(answer.body);
  if (coding === 'gzip') return gunzipSync(answer.body);
  return answer.body;
}

/** The largest built script, e.g. the plotting library's chunk. */
function largestScript(): { url: string; bytes: Buffer } {
  const dir = resolve(process.env.QUADRILLE_TEST_ENTRY ? join(process.env.QUADRILLE_TEST_ENTRY, '../../client') : 'dist/client', '_astro');
  const name = readdirSync(dir)
    .filter((file) => file.endsWith('.js'))
    .sort((a, b) => statSync(join(dir, b)).size - statSync(join(dir, a)).size)[0]!;
  return { url: `/_astro/${name}`, bytes: readFileSync(join(dir, name)) };
}

describe('static assets', () => {
  it('sends the brotli copy to a client that accepts brotli, marked so caches keep the codings apart', async () => {
    const script = largestScript();
    const answer = await rawGet(script.url, { 'accept-encoding': 'gzip, deflate, br' });
    expect(answer.status).toBe(200);
    expect(answer.headers['content-encoding']).toBe('br');
    expect(answer.headers.vary).toMatch(/accept-encoding/i);
    expect(answer.headers['content-type']).toMatch(/javascript/);
    expect(answer.body.length).toBeLessThan(script.bytes.length / 2);
    expect(decode(answer).equals(script.bytes)).toBe(true);
  });

  it('sends gzip when brotli is not accepted, and the plain file when nothing is', async () => {
    const script = largestScript();
    const gzipped = await rawGet(script.url, { 'accept-encoding': 'gzip, br;q=0' });
    expect(gzipped.headers['content-encoding']).toBe('gzip');
    expect(decode(gzipped).equals(script.bytes)).toBe(true);

    const plain = await rawGet(script.url, { 'accept-encoding': 'identity' });
    expect(plain.status).toBe(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body.equals(script.bytes)).toBe(true);
  });
});

describe('JSON answers', () => {
  it('compresses a JSON answer of several kB and decodes to the same document as the plain answer', async () => {
    const plain = await rawGet('/api/captures?pageSize=100', {});
    expect(plain.status).toBe(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body.length).toBeGreaterThan(4096);

    const compressed = await rawGet('/api/captures?pageSize=100', { 'accept-encoding': 'br, gzip' });
    expect(compressed.status).toBe(200);
    expect(compressed.headers['content-encoding']).toBe('br');
    expect(compressed.headers.vary).toMatch(/accept-encoding/i);
    expect(compressed.body.length).toBeLessThan(plain.body.length / 2);
    // The storage usage in the answer may move between the two requests; the captures do not.
    expect(JSON.parse(decode(compressed).toString()).items).toEqual(JSON.parse(plain.body.toString()).items);

    const gzipped = await rawGet('/api/captures?pageSize=100', { 'accept-encoding': 'gzip' });
    expect(gzipped.headers['content-encoding']).toBe('gzip');
    expect(JSON.parse(decode(gzipped).toString()).items).toEqual(JSON.parse(plain.body.toString()).items);
  });

  it('leaves a small JSON answer plain', async () => {
    const answer = await rawGet('/api/me', { 'accept-encoding': 'br, gzip' });
    expect(answer.status).toBe(200);
    expect(answer.body.length).toBeLessThan(2048);
    expect(answer.headers['content-encoding']).toBeUndefined();
    expect(JSON.parse(answer.body.toString()).email).toBe('engineer@saltmarsh.test');
  });
});

describe('never compressed', () => {
  it('leaves sample data plain, whole or ranged', async () => {
    const list = await engineer.get('/api/captures?pageSize=1');
    const id = list.body.items[0].id as string;
    const ranged = await rawGet(`/api/captures/${id}/data`, { 'accept-encoding': 'br, gzip', range: 'bytes=0-1023' });
    expect(ranged.status).toBe(206);
    expect(ranged.headers['content-encoding']).toBeUndefined();
    expect(ranged.body.length).toBe(1024);

    const whole = await rawGet(`/api/captures/${id}/data`, { 'accept-encoding': 'br, gzip' });
    expect(whole.status).toBe(200);
    expect(whole.headers['content-encoding']).toBeUndefined();
    expect(ranged.body.equals(whole.body.subarray(0, 1024))).toBe(true);
  });

  it('leaves a run event stream plain', async () => {
    // A demo chain on the demo capture it was written for.
    const captures = (await engineer.get('/api/captures?pageSize=100')).body.items as { id: string; name: string }[];
    const chains = (await engineer.get('/api/chains?pageSize=100')).body.items as { id: string; name: string }[];
    const capture = captures.find((item) => item.name === 'Saltmarsh rev A: node beacon, bench 1')!;
    const chain = chains.find((item) => item.name === 'Beacon down-conversion')!;
    const submitted = await engineer.post('/api/runs', { chain_id: chain.id, capture_id: capture.id });
    expect(submitted.status).toBe(202);
    const answer = await rawGet(`/api/runs/${submitted.body.runs[0].id}/events`, { 'accept-encoding': 'br, gzip', accept: 'text/event-stream' }, true);
    expect(answer.status).toBe(200);
    expect(answer.headers['content-type']).toMatch(/^text\/event-stream/);
    expect(answer.headers['content-encoding']).toBeUndefined();
  });
});
