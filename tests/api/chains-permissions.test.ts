import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import { Client } from '../helpers/client';
import { countRows, createChain, downConversion, extraAccount, signedIn } from './chains-helpers';

let server: TestServer;
let owner: Client;
let colleague: Client;
let operator: Client;
let admin: Client;
let teamChain: string;
let privateChain: string;

beforeAll(async () => {
  server = await startServer();
  owner = await signedIn(server, 'engineer@saltmarsh.test');
  operator = await signedIn(server, 'operator@saltmarsh.test');
  admin = await signedIn(server, 'admin@saltmarsh.test');
  colleague = await extraAccount(server, admin, 'bench@saltmarsh.test', 'engineer');
  teamChain = await createChain(owner, { name: 'Shared beacon chain', visibility: 'team' });
  privateChain = await createChain(owner, { name: 'Private experiment', visibility: 'private' });
  const edited = downConversion();
  edited.stages[1]!.params.cutoff = 150_000;
  expect((await owner.post(`/api/chains/${teamChain}/revisions`, { document: edited, message: 'tighter' })).status).toBe(201);
});
afterAll(async () => {
  await server?.stop();
});

/** Every write an editor could attempt on a chain. */
function writes(id: string): Array<[string, string, unknown]> {
  return [
    ['POST', `/api/chains/${id}/revisions`, { document: downConversion(), message: 'not mine' }],
    ['PATCH', `/api/chains/${id}`, { name: 'Renamed by someone else' }],
    ['POST', `/api/chains/${id}/restore`, { revision: 1 }],
    ['DELETE', `/api/chains/${id}`, undefined],
  ];
}

function reads(id: string): string[] {
  return [`/api/chains/${id}`, `/api/chains/${id}/revisions`, `/api/chains/${id}/revisions/1`, `/api/chains/${id}/diff?from=1&to=2`, `/api/chains/${id}/export`];
}

async function snapshot() {
  return { chains: await server.db('chains').orderBy('id'), revisions: await countRows(server.db, 'chain_revisions') };
}

describe('operators', () => {
  it('read a team chain, see it as read-only but runnable', async () => {
    for (const path of reads(teamChain)) expect((await operator.get(path)).status, path).toBe(200);
    const chain = (await operator.get(`/api/chains/${teamChain}`)).body;
    expect(chain.permissions).toEqual({ update: false, delete: false, fork: false, run: true });
  });

  it('get 403 for every write, fork and create, and change nothing', async () => {
    const before = await snapshot();
    for (const [method, path, json] of [...writes(teamChain), ['POST', `/api/chains/${teamChain}/fork`, {}] as [string, string, unknown]]) {
      const response = await operator.request(method, path, json === undefined ? {} : { json });
      expect(response.status, `${method} ${path}`).toBe(403);
      expect(response.body.error.code).toBe('forbidden');
    }
    const create = await operator.post('/api/chains', { name: 'Operator chain', visibility: 'team', document: downConversion() });
    expect(create.status).toBe(403);
    expect(await snapshot()).toEqual(before);
  });
});

describe("another engineer's private chain", () => {
  it('answers 404 to every request, exactly like a chain that does not exist', async () => {
    const missing = await colleague.get('/api/chains/00000000-0000-4000-8000-000000000000');
    for (const path of reads(privateChain)) {
      const response = await colleague.get(path);
      expect(response.status, path).toBe(404);
      expect(response.body).toEqual(missing.body);
    }
    const before = await snapshot();
    for (const [method, path, json] of [...writes(privateChain), ['POST', `/api/chains/${privateChain}/fork`, {}] as [string, string, unknown]]) {
      const response = await colleague.request(method, path, json === undefined ? {} : { json });
      expect(response.status, `${method} ${path}`).toBe(404);
    }
    // Private means owner only: the admin does not see it either, and the operator gets 404 rather than 403.
    expect((await admin.get(`/api/chains/${privateChain}`)).status).toBe(404);
    expect((await operator.post(`/api/chains/${privateChain}/revisions`, { document: downConversion() })).status).toBe(404);
    expect(await snapshot()).toEqual(before);
  });

  it('is not listed for others', async () => {
    for (const client of [colleague, operator, admin]) {
      const ids = (await client.get('/api/chains?pageSize=100')).body.items.map((chain: { id: string }) => chain.id);
      expect(ids).toContain(teamChain);
      expect(ids).not.toContain(privateChain);
    }
    const ownIds = (await owner.get('/api/chains?pageSize=100')).body.items.map((chain: { id: string }) => chain.id);
    expect(ownIds).toEqual(expect.arrayContaining([teamChain, privateChain]));
  });
});

describe("another engineer and a team chain", () => {
  it('may read but not edit it', async () => {
    const before = await snapshot();
    for (const [method, path, json] of writes(teamChain)) {
      const response = await colleague.request(method, path, json === undefined ? {} : { json });
      expect(response.status, `${method} ${path}`).toBe(403);
    }
    expect(await snapshot()).toEqual(before);
    expect((await colleague.get(`/api/chains/${teamChain}`)).body.permissions).toEqual({ update: false, delete: false, fork: true, run: true });
  });

  it('forks a chosen revision into a private chain of their own', async () => {
    const source = (await colleague.get(`/api/chains/${teamChain}/revisions/1`)).body;
    const fork = await colleague.post(`/api/chains/${teamChain}/fork`, { revision: 1 });
    expect(fork.status).toBe(201);
    expect(fork.body).toEqual({ id: expect.any(String), revision: 1 });
    const copy = (await colleague.get(`/api/chains/${fork.body.id}`)).body;
    expect(copy).toMatchObject({
      name: 'Shared beacon chain (fork)',
      owner: { name: 'Test engineer' },
      visibility: 'private',
      latestRevision: 1,
      forkedFrom: { chainId: teamChain, revision: 1 },
      permissions: { update: true, delete: true, fork: true, run: true },
    });
    expect(copy.revision.document).toEqual(source.document);
    expect(copy.revision.hash).toBe(source.hash);
    expect(copy.revision.message).toBe('Forked from "Shared beacon chain" revision 1');
    // The fork is the forker's own: they can save to it, and the original is untouched.
    expect((await colleague.post(`/api/chains/${fork.body.id}/revisions`, { document: downConversion(), message: 'mine now' })).status).toBe(201);
    expect((await owner.get(`/api/chains/${teamChain}`)).body.latestRevision).toBe(2);
    // ...and it is private: the original's owner cannot see it.
    expect((await owner.get(`/api/chains/${fork.body.id}`)).status).toBe(404);
  });

  it('forks the latest revision by default, under a chosen name', async () => {
    const fork = await colleague.post(`/api/chains/${teamChain}/fork`, { name: 'My beacon variant' });
    const copy = (await colleague.get(`/api/chains/${fork.body.id}`)).body;
    expect(copy).toMatchObject({ name: 'My beacon variant', forkedFrom: { chainId: teamChain, revision: 2 } });
    expect(copy.revision.document.stages[1].params.cutoff).toBe(150_000);
    expect((await colleague.post(`/api/chains/${teamChain}/fork`, { revision: 7 })).status).toBe(404);
  });
});

describe('deleting', () => {
  it('the owner deletes a chain with its revisions', async () => {
    const id = await createChain(owner, { name: 'Short-lived' });
    const deleted = await owner.request('DELETE', `/api/chains/${id}`);
    expect(deleted.status).toBe(204);
    expect(await countRows(server.db, 'chains', id)).toBe(0);
    expect(await countRows(server.db, 'chain_revisions', id)).toBe(0);
    expect((await owner.get(`/api/chains/${id}`)).status).toBe(404);
  });

  it("an admin deletes someone's team chain", async () => {
    const id = await createChain(owner, { name: 'Team clutter', visibility: 'team' });
    expect((await admin.request('DELETE', `/api/chains/${id}`)).status).toBe(204);
    expect(await countRows(server.db, 'chains', id)).toBe(0);
  });
});

describe('signed out', () => {
  it('gets 401 everywhere', async () => {
    const anonymous = new Client(server.baseUrl);
    expect((await anonymous.get('/api/chains')).status).toBe(401);
    expect((await anonymous.get(`/api/chains/${teamChain}`)).status).toBe(401);
    expect((await anonymous.post('/api/chains', { name: 'x', visibility: 'team', document: downConversion() })).status).toBe(401);
  });
});
