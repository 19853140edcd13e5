import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client, sessionCookie } from '../helpers/client';
import { demoPassword } from '@/lib/server/seed';

let server: TestServer;

beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
});

function hashOf(sessionId: string): string {
  return createHash('sha256').update(sessionId).digest('hex');
}

async function signedIn(email = 'engineer@saltmarsh.test'): Promise<Client> {
  const client = new Client(server.baseUrl);
  expect((await client.signIn(email, demoPassword)).status).toBe(200);
  return client;
}

describe('GET /api/me', () => {
  it('answers 401 JSON without a session', async () => {
    const response = await new Client(server.baseUrl).get('/api/me');
    expect(response.status).toBe(401);
    expect(response.body).toEqual({ error: { code: 'unauthenticated', message: expect.any(String), field: null } });
  });

  it('answers id, email, name and role, and nothing else', async () => {
    const response = await (await signedIn('operator@saltmarsh.test')).get('/api/me');
    expect(response.status).toBe(200);
    expect(Object.keys(response.body).sort()).toEqual(['email', 'id', 'name', 'role']);
    expect(response.body.role).toBe('operator');
  });
});

describe('session cookies', () => {
  it('treats a forged cookie as signed out and clears it', async () => {
    const client = new Client(server.baseUrl);
    client.cookies.set(sessionCookie, 'abcdefghijklmnopqrstuvwxyz234567abcdefgh');
    const response = await client.get('/api/me');
    expect(response.status).toBe(401);
    expect(response.headers.getSetCookie().some((line) => line.startsWith(`${sessionCookie}=;`) && /Max-Age=0/i.test(line))).toBe(true);
    expect(client.cookies.has(sessionCookie)).toBe(false);
  });

  it('does not accept the stored hash as a cookie', async () => {
    const owner = await signedIn();
    const thief = new Client(server.baseUrl);
    thief.cookies.set(sessionCookie, hashOf(owner.cookies.get(sessionCookie)!));
    expect((await thief.get('/api/me')).status).toBe(401);
    expect((await owner.get('/api/me')).status).toBe(200);
  });

  it('treats an expired session as signed out, clears the cookie and deletes the row', async () => {
    const client = await signedIn();
    const hash = hashOf(client.cookies.get(sessionCookie)!);
    await server.db('sessions').where({ id: hash }).update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    expect((await client.get('/api/me')).status).toBe(401);
    expect(client.cookies.has(sessionCookie)).toBe(false);
    expect(await server.db('sessions').where({ id: hash }).first()).toBeUndefined();
  });

  it('extends a session past half its life and sends the same id again', async () => {
    const client = await signedIn();
    const sessionId = client.cookies.get(sessionCookie)!;
    const soon = new Date(Date.now() + 24 * 3600 * 1000).toISOString();
    await server.db('sessions').where({ id: hashOf(sessionId) }).update({ expires_at: soon });
    const response = await client.get('/api/me');
    expect(response.status).toBe(200);
    expect(response.headers.getSetCookie().some((line) => line.startsWith(`${sessionCookie}=${sessionId};`))).toBe(true);
    const row = await server.db('sessions').where({ id: hashOf(sessionId) }).first();
    expect(new Date(row.expires_at).getTime()).toBeGreaterThan(Date.now() + 29 * 24 * 3600 * 1000);
  });

  it('ends the sessions of an account disabled while signed in', async () => {
    const client = await signedIn('operator@saltmarsh.test');
    await server.db('users').where({ email: 'operator@saltmarsh.test' }).update({ disabled_at: new Date().toISOString() });
    try {
      expect((await client.get('/api/me')).status).toBe(401);
    } finally {
      await server.db('users').where({ email: 'operator@saltmarsh.test' }).update({ disabled_at: null });
    }
    expect((await client.get('/api/me')).status).toBe(401);
  });
});

describe('POST /api/auth/sign-out', () => {
  it('ends the session: 204, cookie cleared, row deleted, the old cookie no longer works', async () => {
    const client = await signedIn();
    const sessionId = client.cookies.get(sessionCookie)!;
    const response = await client.post('/api/auth/sign-out');
    expect(response.status).toBe(204);
    expect(client.cookies.has(sessionCookie)).toBe(false);
    expect(await server.db('sessions').where({ id: hashOf(sessionId) }).first()).toBeUndefined();
    const replay = new Client(server.baseUrl);
    replay.cookies.set(sessionCookie, sessionId);
    expect((await replay.get('/api/me')).status).toBe(401);
  });

  it('answers 204 without a session too', async () => {
    expect((await new Client(server.baseUrl).post('/api/auth/sign-out')).status).toBe(204);
  });

  it('refuses a cross-site sign-out and keeps the session', async () => {
    const client = await signedIn();
    const response = await client.post('/api/auth/sign-out', {}, { headers: { origin: 'https://elsewhere.test' } });
    expect(response.status).toBe(403);
    expect((await client.get('/api/me')).status).toBe(200);
  });
});

describe('pages and unknown routes', () => {
  it('redirects a signed-out visitor of a page to /sign-in with the way back', async () => {
    const response = await new Client(server.baseUrl).get('/captures?sort=name');
    expect(response.status).toBe(302);
    expect(response.headers.get('location')).toBe('/sign-in?next=%2Fcaptures%3Fsort%3Dname');
  });

  it('answers an unknown API route with JSON 404 and a wrong method with 405', async () => {
    const client = await signedIn();
    const missing = await client.get('/api/no-such-thing');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
    const wrongMethod = await client.request('DELETE', '/api/me');
    expect(wrongMethod.status).toBe(405);
    expect(wrongMethod.body.error.code).toBe('method_not_allowed');
    expect(wrongMethod.headers.get('allow')).toBe('GET');
  });
});
