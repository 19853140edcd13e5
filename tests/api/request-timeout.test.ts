/**
 * The time limit on receiving one request (scripts/serve.mjs, QUADRILLE_REQUEST_TIMEOUT_SECONDS):
 * a one-request upload slower than the limit is cut off and leaves nothing behind, one within it
 * is stored. Node's own default (5 minutes) would cut off any multi-GiB upload over an ordinary
 * link; the product's default is 4 hours.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { expectNothingLeft, sampleBytes, send, sha256, signedIn, snapshot } from './captures-helpers';

let server: TestServer;
let engineer: Client;

beforeAll(async () => {
  server = await startServer({ env: { QUADRILLE_DEMO_CAPTURES: '0', QUADRILLE_REQUEST_TIMEOUT_SECONDS: '2' } });
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
});

/** Bytes the body of the latest slowUpload has handed over so far. */
let sent = 0;

/** Sends `bytes` as a chunked body, one piece every `gapMs`. */
function slowUpload(bytes: Uint8Array, pieces: number, gapMs: number, name: string) {
  const size = Math.ceil(bytes.length / pieces);
  sent = 0;
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (sent >= bytes.length) return controller.close();
      if (sent > 0) await new Promise((wake) => setTimeout(wake, gapMs));
      controller.enqueue(bytes.slice(sent, sent + size));
      sent += size;
    },
  });
  const query = new URLSearchParams({ name, datatype: 'ci16_le', sample_rate: '1000000' });
  return send(engineer, 'POST', `/api/captures?${query}`, { body, headers: { 'content-type': 'application/octet-stream' } });
}

describe('request time limit', () => {
  it('stores an upload that ends within the limit', async () => {
    const bytes = sampleBytes('ci16_le', 'complex', 16_384);
    const created = await slowUpload(bytes, 4, 200, 'in time');
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.sha256).toBe(sha256(bytes));
  });

  it('cuts off an upload still sending after the limit, leaving no capture and no bytes', async () => {
    const before = await snapshot(server);
    const bytes = sampleBytes('ci16_le', 'complex', 65_536);
    // 16 pieces 400 ms apart: 6 s of sending against a 2 s limit.
    const outcome = await slowUpload(bytes, 16, 400, 'too slow').then(
      (response) => ({ status: response.status as number | string, sentThen: sent }),
      () => ({ status: 'connection closed' as number | string, sentThen: sent }),
    );
    // Node answers 408 when it can, or closes the connection.
    expect([408, 'connection closed']).toContain(outcome.status);
    // The server ended it while the client still had pieces to send, not after the whole body.
    expect(outcome.sentThen).toBeLessThan(bytes.length);
    await expectNothingLeft(server, before);
  });
});
