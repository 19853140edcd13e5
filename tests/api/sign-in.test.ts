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

async function sessionCount(): Promise<number> {
  const row = await server.db('sessions').count<{ count: number }[]>({ count: '*' }).first();
  return Number(row?.count);
}

function expectError(response: { status: number; body: any }, status: number, code: string, field: string | null = null) {
  expect(response.status).toBe(status);
  expect(response.body).toEqual({ error: { code, message: expect.any(String), field } });
}

describe('POST /api/auth/sign-in', () => {
  it('signs a demo account in with an httpOnly, SameSite=Lax session cookie', async () => {
    const client = new Client(server.baseUrl);
    const response = await client.signIn('engineer@saltmarsh.test', demoPassword);
    expect(response.status).toBe(200);
    expect(response.body.user).toEqual({ id: expect.any(String), email: 'engineer@saltmarsh.test', name: 'Teodor Lindqvist', role: 'engineer' });
    const cookie = response.headers.getSetCookie().find((line) => line.startsWith(`${sessionCookie}=`));
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Not production here, so not Secure (plain http on localhost must keep working).
    expect(cookie).not.toMatch(/Secure/i);
    const me = await client.get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body).toEqual(response.body.user);
  });

  it('stores only the SHA-256 of the session id', async () => {
    const client = new Client(server.baseUrl);
    await client.signIn('operator@saltmarsh.test', demoPassword);
    const sessionId = client.cookies.get(sessionCookie)!;
    const { createHash } = await import('node:crypto');
    const hash = createHash('sha256').update(sessionId).digest('hex');
    expect(await server.db('sessions').where({ id: sessionId }).first()).toBeUndefined();
    expect(await server.db('sessions').where({ id: hash }).first()).toBeDefined();
  });

  it('accepts the e-mail in any case and with surrounding blanks', async () => {
    const response = await new Client(server.baseUrl).signIn('  Admin@Saltmarsh.TEST ', demoPassword);
    expect(response.status).toBe(200);
    expect(response.body.user.role).toBe('admin');
  });

  it('answers 401 invalid_credentials for a wrong password and creates no session', async () => {
    const before = await sessionCount();
    const client = new Client(server.baseUrl);
    const response = await client.signIn('engineer@saltmarsh.test', 'not the password');
    expectError(response, 401, 'invalid_credentials');
    expect(client.cookies.has(sessionCookie)).toBe(false);
    expect(await sessionCount()).toBe(before);
  });

  it('answers an unknown e-mail exactly like a wrong password', async () => {
    const before = await sessionCount();
    const response = await new Client(server.baseUrl).signIn('nobody@saltmarsh.test', demoPassword);
    expectError(response, 401, 'invalid_credentials');
    expect(response.body.error.message).toBe('E-mail or password is wrong.');
    expect(await sessionCount()).toBe(before);
  });

  it('answers 400 invalid_json for malformed JSON', async () => {
    const response = await new Client(server.baseUrl).post('/api/auth/sign-in', undefined, { raw: '{"email": "a@b.test",' });
    expectError(response, 400, 'invalid_json');
  });

  it('answers 415 for a body that is not JSON', async () => {
    const response = await new Client(server.baseUrl).post('/api/auth/sign-in', undefined, {
      raw: 'email=a@b.test',
      contentType: 'application/x-www-form-urlencoded',
    });
    expect(response.status).toBe(415);
    expect(response.body.error.code).toBe('unsupported_media_type');
  });

  it('names the missing field', async () => {
    const client = new Client(server.baseUrl);
    expectError(await client.post('/api/auth/sign-in', { email: 'engineer@saltmarsh.test' }), 400, 'required', 'password');
    expectError(await client.post('/api/auth/sign-in', { password: demoPassword }), 400, 'required', 'email');
    expectError(await client.post('/api/auth/sign-in', { email: '', password: demoPassword }), 400, 'required', 'email');
  });

  it('names a field of the wrong type or shape', async () => {
    const client = new Client(server.baseUrl);
    expectError(await client.post('/api/auth/sign-in', { email: 'not-an-address', password: 'x' }), 400, 'invalid_field', 'email');
    expectError(await client.post('/api/auth/sign-in', { email: 'a@b.test', password: 12 }), 400, 'invalid_field', 'password');
    expectError(await client.post('/api/auth/sign-in', [1, 2]), 400, 'invalid_field');
    expectError(await client.post('/api/auth/sign-in', { email: 'a@b.test', password: 'x', admin: true }), 400, 'unknown_field', 'admin');
  });

  it('rejects overlong strings before checking anything', async () => {
    const before = await server.db('sign_in_failures').count<{ count: number }[]>({ count: '*' }).first();
    const client = new Client(server.baseUrl);
    const longPassword = await client.signIn('engineer@saltmarsh.test', 'x'.repeat(257));
    expectError(longPassword, 400, 'too_long', 'password');
    const longEmail = await client.signIn(`${'a'.repeat(250)}@saltmarsh.test`, demoPassword);
    expectError(longEmail, 400, 'too_long', 'email');
    const after = await server.db('sign_in_failures').count<{ count: number }[]>({ count: '*' }).first();
    expect(Number(after?.count)).toBe(Number(before?.count));
  });

  it('answers 413 for a body over the size limit', async () => {
    const response = await new Client(server.baseUrl).post('/api/auth/sign-in', { email: 'a@b.test', password: 'x'.repeat(100_000) });
    expectError(response, 413, 'payload_too_large');
  });

  it('answers 403 account_disabled for a disabled account with the right password, and nothing for a wrong one', async () => {
    await server.db('users').where({ email: 'operator@saltmarsh.test' }).update({ disabled_at: new Date().toISOString() });
    try {
      const before = await sessionCount();
      const client = new Client(server.baseUrl);
      expectError(await client.signIn('operator@saltmarsh.test', demoPassword), 403, 'account_disabled');
      expectError(await client.signIn('operator@saltmarsh.test', 'wrong password'), 401, 'invalid_credentials');
      expect(client.cookies.has(sessionCookie)).toBe(false);
      expect(await sessionCount()).toBe(before);
    } finally {
      await server.db('users').where({ email: 'operator@saltmarsh.test' }).update({ disabled_at: null });
    }
  });

  it('replaces an existing session with a new one', async () => {
    const client = new Client(server.baseUrl);
    await client.signIn('engineer@saltmarsh.test', demoPassword);
    const first = client.cookies.get(sessionCookie);
    await client.signIn('engineer@saltmarsh.test', demoPassword);
    expect(client.cookies.get(sessionCookie)).not.toBe(first);
    const stale = new Client(server.baseUrl);
    stale.cookies.set(sessionCookie, first!);
    expect((await stale.get('/api/me')).status).toBe(401);
  });
});
