import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client } from '../helpers/client';
import { demoPassword } from '@/lib/server/seed';

let server: TestServer;

beforeAll(async () => {
  server = await startServer();
});
afterAll(async () => {
  await server?.stop();
});

const email = 'engineer@saltmarsh.test';

async function signedIn(password = demoPassword): Promise<Client> {
  const client = new Client(server.baseUrl);
  expect((await client.signIn(email, password)).status).toBe(200);
  return client;
}

async function passwordHash(): Promise<string> {
  return (await server.db('users').where({ email }).first()).password_hash;
}

describe('POST /api/account/password', () => {
  it('answers 401 without a session', async () => {
    const response = await new Client(server.baseUrl).post('/api/account/password', { currentPassword: demoPassword, newPassword: 'x'.repeat(12) });
    expect(response.status).toBe(401);
  });

  it('refuses bad input and changes nothing', async () => {
    const client = await signedIn();
    const before = await passwordHash();
    const cases: Array<[unknown, number, string, string | null]> = [
      [{ currentPassword: 'wrong password', newPassword: 'a new long password' }, 403, 'wrong_password', 'currentPassword'],
      [{ currentPassword: demoPassword, newPassword: 'short' }, 400, 'too_short', 'newPassword'],
      [{ currentPassword: demoPassword, newPassword: 'y'.repeat(257) }, 400, 'too_long', 'newPassword'],
      [{ currentPassword: demoPassword }, 400, 'required', 'newPassword'],
      [{ currentPassword: demoPassword, newPassword: demoPassword }, 422, 'password_unchanged', 'newPassword'],
    ];
    for (const [body, status, code, field] of cases) {
      const response = await client.post('/api/account/password', body);
      expect(response.status, JSON.stringify(body)).toBe(status);
      expect(response.body.error).toMatchObject({ code, field });
    }
    expect(await passwordHash()).toBe(before);
    expect((await client.get('/api/me')).status).toBe(200);
  });

  it('changes the password, keeps this session and ends every other one', async () => {
    const other = await signedIn();
    const client = await signedIn();
    const response = await client.post('/api/account/password', { currentPassword: demoPassword, newPassword: 'saltmarsh rev B' });
    expect(response.status).toBe(204);
    expect((await client.get('/api/me')).status).toBe(200);
    expect((await other.get('/api/me')).status).toBe(401);
    expect((await new Client(server.baseUrl).signIn(email, demoPassword)).status).toBe(401);
    expect((await new Client(server.baseUrl).signIn(email, 'saltmarsh rev B')).status).toBe(200);
    const hash = await passwordHash();
    expect(hash.startsWith('$argon2id$')).toBe(true);
  });
});
