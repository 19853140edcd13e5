import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client, sessionCookie } from '../helpers/client';
import { demoPassword } from '@/lib/server/seed';
import { accountFailureLimit, addressFailureLimit, failureWindowMs } from '@/lib/server/auth/rate-limit';

let server: TestServer;

beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
});

describe('sign-in rate limit', () => {
  it('refuses an account after 5 failures in 15 min with 429 and Retry-After, even with the right password', async () => {
    expect(accountFailureLimit).toBe(5);
    const client = new Client(server.baseUrl);
    for (let attempt = 0; attempt < accountFailureLimit; attempt++) {
      expect((await client.signIn('engineer@saltmarsh.test', `guess ${attempt}`)).status).toBe(401);
    }
    const limited = await client.signIn('engineer@saltmarsh.test', demoPassword);
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('rate_limited');
    const retryAfter = Number(limited.headers.get('retry-after'));
    expect(retryAfter).toBeGreaterThan(failureWindowMs / 1000 - 60);
    expect(retryAfter).toBeLessThanOrEqual(failureWindowMs / 1000);
    expect(client.cookies.has(sessionCookie)).toBe(false);
    // Refused attempts are not counted, so waiting out the window is enough.
    expect(Number((await server.db('sign_in_failures').where({ account_email: 'engineer@saltmarsh.test' }).count({ count: '*' }))[0]!.count)).toBe(
      accountFailureLimit,
    );
    // Other accounts from the same address still sign in.
    expect((await new Client(server.baseUrl).signIn('admin@saltmarsh.test', demoPassword)).status).toBe(200);
  });

  it('lets the account in again once its failures leave the window', async () => {
    const past = new Date(Date.now() - failureWindowMs - 1000).toISOString();
    await server.db('sign_in_failures').where({ account_email: 'engineer@saltmarsh.test' }).update({ failed_at: past });
    expect((await new Client(server.baseUrl).signIn('engineer@saltmarsh.test', demoPassword)).status).toBe(200);
  });

  it('refuses an address after 20 failures across accounts', async () => {
    await server.db('sign_in_failures').delete();
    const client = new Client(server.baseUrl);
    for (let attempt = 0; attempt < addressFailureLimit; attempt++) {
      // Spread over many (unknown) accounts so the per-account limit never triggers.
      expect((await client.signIn(`sweep${attempt}@saltmarsh.test`, 'guess')).status).toBe(401);
    }
    const limited = await client.signIn('operator@saltmarsh.test', demoPassword);
    expect(limited.status).toBe(429);
    expect(Number(limited.headers.get('retry-after'))).toBeGreaterThan(0);
  });
});
