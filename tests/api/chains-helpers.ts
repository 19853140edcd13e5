/**
 * Shared pieces of the chain API tests: a valid four-stage document and signed-in clients.
 */
import { expect } from 'vitest';
import type { Knex } from 'knex';
import { Client } from '../helpers/client';
import type { TestServer } from '../helpers/server';
import { demoPassword } from '@/lib/server/seed';

/** Mix the beacon to 0 Hz, low-pass, decimate by 8, spectrum probe: valid for 4 Msps complex input. */
export function downConversion(): { version: 1; name: string; stages: Array<Record<string, any>> } {
  return {
    version: 1,
    name: 'Test down-conversion',
    stages: [
      { id: 'nco', kind: 'mix', params: { frequency: -600_000 } },
      { id: 'lp', kind: 'filter', params: { design: 'window', response: 'lowpass', cutoff: 200_000, taps: 127 } },
      { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false } },
      { id: 'psd', kind: 'spectrum', params: { fftSize: 1024 }, probe: true },
    ],
  };
}

/** A client signed in as `email`. */
export async function signedIn(server: TestServer, email: string, password = demoPassword): Promise<Client> {
  const client = new Client(server.baseUrl);
  expect((await client.signIn(email, password)).status).toBe(200);
  return client;
}

/** Creates an extra account through the admin API and signs it in. */
export async function extraAccount(server: TestServer, admin: Client, email: string, role: 'engineer' | 'operator'): Promise<Client> {
  const password = 'another long password';
  const created = await admin.post('/api/admin/users', { email, name: `Test ${role}`, role, password });
  expect(created.status).toBe(201);
  return signedIn(server, email, password);
}

/** Creates a chain and answers its id. */
export async function createChain(client: Client, body: Record<string, unknown>): Promise<string> {
  const response = await client.post('/api/chains', { name: 'Test chain', visibility: 'private', document: downConversion(), ...body });
  expect(response.status, response.text).toBe(201);
  return response.body.id;
}

/** Rows in a table (all, or those of one chain). */
export async function countRows(db: Knex, table: 'chains' | 'chain_revisions', chainId?: string): Promise<number> {
  const query = db(table);
  if (chainId) query.where(table === 'chains' ? { id: chainId } : { chain_id: chainId });
  return Number((await query.count<{ count: number }[]>({ count: '*' }))[0]!.count);
}
