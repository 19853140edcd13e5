import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client } from '../helpers/client';
import { demoPassword } from '@/lib/server/seed';

let server: TestServer;
let admin: Client;

beforeAll(async () => {
  server = await startServer();
  admin = await signedIn('admin@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
});

async function signedIn(email: string, password = demoPassword): Promise<Client> {
  const client = new Client(server.baseUrl);
  expect((await client.signIn(email, password)).status).toBe(200);
  return client;
}

async function userCount(): Promise<number> {
  return Number((await server.db('users').count<{ count: number }[]>({ count: '*' }))[0]!.count);
}

const newAccount = { email: 'tech@saltmarsh.test', name: 'Ines Varga', role: 'operator', password: 'a fine long password' };

describe('admin endpoints refuse other roles', () => {
  it.each(['engineer@saltmarsh.test', 'operator@saltmarsh.test'])('%s gets 403 and changes nothing', async (email) => {
    const client = await signedIn(email);
    const before = await userCount();
    expect((await client.get('/api/admin/users')).status).toBe(403);
    const create = await client.post('/api/admin/users', { ...newAccount, email: 'sneaky@saltmarsh.test', role: 'admin' });
    expect(create.status).toBe(403);
    expect(create.body.error.code).toBe('forbidden');
    const self = (await client.get('/api/me')).body;
    const promote = await client.patch(`/api/admin/users/${self.id}`, { role: 'admin' });
    expect(promote.status).toBe(403);
    expect(await userCount()).toBe(before);
    expect((await server.db('users').where({ id: self.id }).first()).role).not.toBe('admin');
  });

  it('signed-out visitors get 401', async () => {
    expect((await new Client(server.baseUrl).get('/api/admin/users')).status).toBe(401);
  });
});

describe('GET /api/admin/users', () => {
  it('lists accounts without password hashes', async () => {
    const response = await admin.get('/api/admin/users');
    expect(response.status).toBe(200);
    expect(response.body.users.map((user: { email: string }) => user.email)).toEqual(
      expect.arrayContaining(['admin@saltmarsh.test', 'engineer@saltmarsh.test', 'operator@saltmarsh.test']),
    );
    expect(response.text).not.toContain('argon2');
    expect(Object.keys(response.body.users[0]).sort()).toEqual(['createdAt', 'disabled', 'disabledAt', 'email', 'id', 'lastSignInAt', 'name', 'role']);
  });
});

describe('POST /api/admin/users', () => {
  it('creates an account that can sign in with its role', async () => {
    const response = await admin.post('/api/admin/users', newAccount);
    expect(response.status).toBe(201);
    expect(response.body.user).toMatchObject({ email: 'tech@saltmarsh.test', name: 'Ines Varga', role: 'operator', disabled: false });
    const tech = await signedIn('tech@saltmarsh.test', newAccount.password);
    expect((await tech.get('/api/me')).body.role).toBe('operator');
  });

  it('refuses bad input and creates nothing', async () => {
    const before = await userCount();
    const cases: Array<[unknown, number, string, string | null]> = [
      [{ ...newAccount, email: 'ENGINEER@saltmarsh.test' }, 409, 'email_taken', 'email'],
      [{ ...newAccount, email: 'x@saltmarsh.test', role: 'superuser' }, 400, 'invalid_field', 'role'],
      [{ ...newAccount, email: 'x@saltmarsh.test', name: 'n'.repeat(101) }, 400, 'too_long', 'name'],
      [{ ...newAccount, email: 'x@saltmarsh.test', password: 'short' }, 400, 'too_short', 'password'],
      [{ email: 'x@saltmarsh.test', role: 'operator', password: 'a fine long password' }, 400, 'required', 'name'],
      [{ ...newAccount, email: 'not an address' }, 400, 'invalid_field', 'email'],
    ];
    for (const [body, status, code, field] of cases) {
      const response = await admin.post('/api/admin/users', body);
      expect(response.status, JSON.stringify(body)).toBe(status);
      expect(response.body.error).toMatchObject({ code, field });
    }
    const malformed = await admin.post('/api/admin/users', undefined, { raw: '{"email":' });
    expect(malformed.body.error.code).toBe('invalid_json');
    expect(await userCount()).toBe(before);
  });
});

describe('PATCH /api/admin/users/:id', () => {
  async function idOf(email: string): Promise<string> {
    return (await server.db('users').where({ email }).first()).id;
  }

  it('changes name and role', async () => {
    const id = await idOf('tech@saltmarsh.test');
    const response = await admin.patch(`/api/admin/users/${id}`, { name: 'Ines Varga-Holm', role: 'engineer' });
    expect(response.status).toBe(200);
    expect(response.body.user).toMatchObject({ name: 'Ines Varga-Holm', role: 'engineer' });
  });

  it('disabling ends the sessions of the account and blocks sign-in; enabling restores it', async () => {
    const id = await idOf('tech@saltmarsh.test');
    const tech = await signedIn('tech@saltmarsh.test', newAccount.password);
    const response = await admin.patch(`/api/admin/users/${id}`, { disabled: true });
    expect(response.status).toBe(200);
    expect(response.body.user.disabled).toBe(true);
    expect((await tech.get('/api/me')).status).toBe(401);
    expect(await server.db('sessions').where({ user_id: id }).first()).toBeUndefined();
    expect((await new Client(server.baseUrl).signIn('tech@saltmarsh.test', newAccount.password)).body.error.code).toBe('account_disabled');
    expect((await admin.patch(`/api/admin/users/${id}`, { disabled: false })).body.user.disabled).toBe(false);
    expect((await new Client(server.baseUrl).signIn('tech@saltmarsh.test', newAccount.password)).status).toBe(200);
  });

  it('refuses to demote or disable the last active admin', async () => {
    const id = await idOf('admin@saltmarsh.test');
    const before = await server.db('users').where({ id }).first();
    const demote = await admin.patch(`/api/admin/users/${id}`, { role: 'engineer' });
    expect(demote.status).toBe(422);
    expect(demote.body.error).toMatchObject({ code: 'last_admin', field: 'role' });
    expect((await admin.patch(`/api/admin/users/${id}`, { disabled: true })).status).toBe(422);
    expect(await server.db('users').where({ id }).first()).toEqual(before);
  });

  it('answers 404 for an unknown or malformed id and 400 for an empty or unknown change', async () => {
    expect((await admin.patch('/api/admin/users/00000000-0000-4000-8000-000000000000', { name: 'X' })).status).toBe(404);
    expect((await admin.patch('/api/admin/users/not-an-id', { name: 'X' })).status).toBe(404);
    const id = await idOf('operator@saltmarsh.test');
    const before = await server.db('users').where({ id }).first();
    expect((await admin.patch(`/api/admin/users/${id}`, {})).status).toBe(400);
    const unknown = await admin.patch(`/api/admin/users/${id}`, { password_hash: 'x' });
    expect(unknown.body.error).toMatchObject({ code: 'unknown_field', field: 'password_hash' });
    expect(await server.db('users').where({ id }).first()).toEqual(before);
  });
});
