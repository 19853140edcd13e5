import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client } from '../helpers/client';

let server: TestServer;

beforeAll(async () => {
  server = await startServer({ demo: false });
});
afterAll(async () => {
  await server?.stop();
});

describe('first account on an empty database', () => {
  it('refuses bad input and creates nothing', async () => {
    const response = await new Client(server.baseUrl).post('/api/setup', { email: 'lead@saltmarsh.test', name: 'Lead', password: 'short' });
    expect(response.status).toBe(400);
    expect(response.body.error.field).toBe('password');
    expect(await server.db('users').first()).toBeUndefined();
  });

  it('becomes admin and is signed in', async () => {
    const client = new Client(server.baseUrl);
    const response = await client.post('/api/setup', { email: 'lead@saltmarsh.test', name: 'Ada Lead', password: 'first account pass' });
    expect(response.status).toBe(201);
    expect(response.body.user.role).toBe('admin');
    expect((await client.get('/api/me')).body.email).toBe('lead@saltmarsh.test');
  });

  it('is closed once an account exists', async () => {
    const response = await new Client(server.baseUrl).post('/api/setup', { email: 'late@saltmarsh.test', name: 'Late', password: 'another long pass' });
    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe('already_set_up');
    expect(await server.db('users').where({ email: 'late@saltmarsh.test' }).first()).toBeUndefined();
  });
});
