import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { parseChainDocument, propagateChain } from '@/dsp/chain';
import { countRows, createChain, downConversion, signedIn } from './chains-helpers';
import { apiErrorBodySchema } from '@/contracts/errors';

let server: TestServer;
let engineer: Client;

beforeAll(async () => {
  server = await startServer();
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
});

function sha256(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

/**
 * downConversion() as the server must store it, written out by hand (not by the engine's
 * canonicalChain): every stage default filled in from the stage schemas (mix phase 0; window FIR
 * hamming, beta 8.6; spectrum hann, 50 % overlap, mean averaging, density scaling, 0 dB
 * calibration), params sorted by key, probe and bypass explicit, keys in canonical order.
 */
const canonicalDownConversion = {
  version: 1,
  name: 'Test down-conversion',
  stages: [
    { id: 'nco', kind: 'mix', params: { frequency: -600_000, phase: 0 }, probe: false, bypass: false },
    {
      id: 'lp',
      kind: 'filter',
      params: { beta: 8.6, cutoff: 200_000, design: 'window', response: 'lowpass', taps: 127, window: 'hamming' },
      probe: false,
      bypass: false,
    },
    { id: 'dec', kind: 'decimate', params: { antiAlias: false, factor: 8 }, probe: false, bypass: false },
    {
      id: 'psd',
      kind: 'spectrum',
      params: { averaging: 'mean', beta: 8.6, calibrationDb: 0, fftSize: 1024, overlap: 0.5, scaling: 'density', window: 'hann' },
      probe: true,
      bypass: false,
    },
  ],
};

describe('create, get and list', () => {
  it('creates a chain with revision 1 holding the document with its defaults filled in', async () => {
    const document = downConversion();
    const created = await engineer.post('/api/chains', { name: 'Beacon at 0 Hz', visibility: 'team', document, description: 'bench 1' });
    expect(created.status).toBe(201);
    expect(created.body).toEqual({ id: expect.any(String), revision: 1 });

    const got = await engineer.get(`/api/chains/${created.body.id}`);
    expect(got.status).toBe(200);
    expect(got.body).toMatchObject({
      id: created.body.id,
      name: 'Beacon at 0 Hz',
      description: 'bench 1',
      owner: { name: 'Teodor Lindqvist' },
      visibility: 'team',
      latestRevision: 1,
      forkedFrom: null,
      permissions: { update: true, delete: true, fork: true, run: true },
    });
    expect(Object.keys(got.body).sort()).toEqual(
      ['createdAt', 'description', 'forkedFrom', 'id', 'latestRevision', 'name', 'owner', 'permissions', 'revision', 'updatedAt', 'visibility'].sort(),
    );
    const revision = got.body.revision;
    expect(revision).toMatchObject({ chainId: created.body.id, revision: 1, author: { name: 'Teodor Lindqvist' } });
    // The stored document is the engine's canonical form: e.g. the mix phase default (0) is now written out.
    expect(revision.document).toEqual(canonicalDownConversion);
    expect(revision.hash).toBe(sha256(JSON.stringify(canonicalDownConversion)));
  });

  it('lists the visible chains a page at a time, filtered by words and owner', async () => {
    for (const name of ['Paging alpha', 'Paging bravo', 'Paging charlie']) await createChain(engineer, { name, description: 'pager test' });
    const first = await engineer.get('/api/chains?q=paging&pageSize=2&page=1');
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ total: 3, page: 1, pageSize: 2 });
    expect(first.body.items).toHaveLength(2);
    const second = await engineer.get('/api/chains?q=paging&pageSize=2&page=2');
    expect(second.body.items).toHaveLength(1);
    const names = [...first.body.items, ...second.body.items].map((chain: { name: string }) => chain.name).sort();
    expect(names).toEqual(['Paging alpha', 'Paging bravo', 'Paging charlie']);
    // Newest change first.
    expect(first.body.items[0].name).toBe('Paging charlie');

    expect((await engineer.get('/api/chains?q=PAGING%20bravo')).body.items.map((c: { name: string }) => c.name)).toEqual(['Paging bravo']);
    expect((await engineer.get('/api/chains?q=pager%20test')).body.total).toBe(3);
    // LIKE wildcards in the words are taken literally.
    expect((await engineer.get('/api/chains?q=paging_alpha')).body.total).toBe(0);
    expect((await engineer.get('/api/chains?q=%25%25')).body.total).toBe(0);
    // ...and a literal % finds the demo chain that mentions the 99 % occupied bandwidth.
    expect((await engineer.get('/api/chains?q=99%20%25')).body.items.map((c: { name: string }) => c.name)).toEqual(['Beacon down-conversion']);
    const mine = await engineer.get('/api/chains?owner=me&pageSize=100');
    expect(mine.body.items.every((chain: { owner: { name: string } }) => chain.owner.name === 'Teodor Lindqvist')).toBe(true);
  });

  it('answers 400 naming the query field for a bad page or owner', async () => {
    expect((await engineer.get('/api/chains?page=0')).body.error).toMatchObject({ code: 'invalid_field', field: 'page' });
    expect((await engineer.get('/api/chains?pageSize=1000')).body.error).toMatchObject({ field: 'pageSize' });
    expect((await engineer.get('/api/chains?owner=someone')).body.error).toMatchObject({ field: 'owner' });
    expect((await engineer.get('/api/chains?sort=owner')).body.error).toMatchObject({ code: 'invalid_field', field: 'sort' });
    expect((await engineer.get('/api/chains?order=up')).body.error).toMatchObject({ code: 'invalid_field', field: 'order' });
    expect((await engineer.get('/api/chains?colour=red')).body.error).toMatchObject({ code: 'unknown_field', field: 'colour' });
  });

  it('sorts by name either way (ignoring case), by revision count, and pages through a sorted list', async () => {
    const words = { q: 'sorting', pageSize: '2' };
    const ids: Record<string, string> = {};
    for (const name of ['sorting Bravo', 'Sorting alpha', 'Sorting charlie']) ids[name] = await createChain(engineer, { name });
    // Two more revisions for "Sorting alpha", one more for "sorting Bravo".
    const document = downConversion();
    for (const [name, count] of [['Sorting alpha', 2], ['sorting Bravo', 1]] as const) {
      for (let k = 0; k < count; k++) expect((await engineer.post(`/api/chains/${ids[name]}/revisions`, { document: { ...document, name: `${name} ${k}` }, message: `edit ${k}` })).status).toBe(201);
    }
    const names = async (params: Record<string, string>) => {
      const answer = await engineer.get(`/api/chains?${new URLSearchParams({ ...words, ...params })}`);
      expect(answer.status, answer.text).toBe(200);
      return answer.body.items.map((chain: { name: string }) => chain.name);
    };
    expect(await names({ sort: 'name', order: 'asc', page: '1' })).toEqual(['Sorting alpha', 'sorting Bravo']);
    expect(await names({ sort: 'name', order: 'asc', page: '2' })).toEqual(['Sorting charlie']);
    expect(await names({ sort: 'name', order: 'desc', page: '1' })).toEqual(['Sorting charlie', 'sorting Bravo']);
    expect(await names({ sort: 'latestRevision', order: 'desc', page: '1' })).toEqual(['Sorting alpha', 'sorting Bravo']);
    expect(await names({ sort: 'latestRevision', order: 'asc', page: '1' })).toEqual(['Sorting charlie', 'sorting Bravo']);
  });

  it('changes name, description and visibility, not the document', async () => {
    const id = await createChain(engineer, { name: 'Before rename' });
    const patched = await engineer.patch(`/api/chains/${id}`, { name: 'After rename', visibility: 'team', description: 'notes' });
    expect(patched.status).toBe(200);
    expect(patched.body).toMatchObject({ name: 'After rename', visibility: 'team', description: 'notes', latestRevision: 1 });
    expect(await countRows(server.db, 'chain_revisions', id)).toBe(1);
    const bad = await engineer.patch(`/api/chains/${id}`, { visibility: 'public' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('visibility');
    expect((await engineer.patch(`/api/chains/${id}`, {})).status).toBe(400);
  });
});

describe('revisions', () => {
  let id: string;
  const edited = () => {
    const document = downConversion();
    document.stages[1]!.params.cutoff = 180_000;
    return document;
  };
  const editedTwice = () => {
    const document = edited();
    document.stages[2]!.params.factor = 4;
    return document;
  };

  // The chain the later tests read: revisions 1 (downConversion), 2 (edited) and 3 (editedTwice).
  beforeAll(async () => {
    id = await createChain(engineer, { name: 'Revisioned chain' });
    expect((await engineer.post(`/api/chains/${id}/revisions`, { document: edited(), message: 'Narrower channel filter' })).status).toBe(201);
    expect((await engineer.post(`/api/chains/${id}/revisions`, { document: editedTwice(), message: 'Keep more rate' })).status).toBe(201);
  });

  it('numbers saved revisions 1, 2, 3 and lists them newest first without documents', async () => {
    // A chain of its own: the other tests here add revisions to the shared one.
    const id = await createChain(engineer, { name: 'Numbered chain' });
    const second = await engineer.post(`/api/chains/${id}/revisions`, { document: edited(), message: 'Narrower channel filter' });
    expect(second.status).toBe(201);
    expect(second.body).toMatchObject({ chainId: id, revision: 2, message: 'Narrower channel filter', author: { name: 'Teodor Lindqvist' } });
    expect(second.body.document.stages[1].params.cutoff).toBe(180_000);
    const third = await engineer.post(`/api/chains/${id}/revisions`, { document: editedTwice(), message: 'Keep more rate' });
    expect(third.body.revision).toBe(3);

    const list = await engineer.get(`/api/chains/${id}/revisions`);
    expect(list.body.items.map((r: { revision: number }) => r.revision)).toEqual([3, 2, 1]);
    expect(Object.keys(list.body.items[0]).sort()).toEqual(['author', 'chainId', 'createdAt', 'hash', 'message', 'revision']);
    expect((await engineer.get(`/api/chains/${id}`)).body.latestRevision).toBe(3);
    const one = await engineer.get(`/api/chains/${id}/revisions/1`);
    expect(one.body.document).toEqual(canonicalDownConversion);
    expect((await engineer.get(`/api/chains/${id}/revisions/9`)).status).toBe(404);
    expect((await engineer.get(`/api/chains/${id}/revisions/0`)).status).toBe(404);
  });

  it('has no way to edit or delete a revision', async () => {
    const before = await server.db('chain_revisions').where({ chain_id: id, revision: 1 }).first();
    for (const method of ['PUT', 'PATCH', 'DELETE', 'POST']) {
      const response = await engineer.request(method, `/api/chains/${id}/revisions/1`, { json: { document: editedTwice(), message: 'rewrite history' } });
      expect(response.status, method).toBe(405);
    }
    expect(await server.db('chain_revisions').where({ chain_id: id, revision: 1 }).first()).toEqual(before);
  });

  it('gives concurrent saves distinct consecutive numbers', async () => {
    const start = (await engineer.get(`/api/chains/${id}`)).body.latestRevision as number;
    const saves = await Promise.all(
      Array.from({ length: 6 }, (_, n) => engineer.post(`/api/chains/${id}/revisions`, { document: edited(), message: `parallel ${n}` })),
    );
    expect(saves.map((save) => save.status)).toEqual(Array(6).fill(201));
    const numbers = saves.map((save) => save.body.revision as number).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 6 }, (_, n) => start + 1 + n));
    expect((await engineer.get(`/api/chains/${id}`)).body.latestRevision).toBe(start + 6);
  });

  it('diffs revision 1 against 3 at parameter level', async () => {
    const diff = await engineer.get(`/api/chains/${id}/diff?from=1&to=3`);
    expect(diff.status).toBe(200);
    expect(diff.body).toEqual({
      from: 1,
      to: 3,
      changes: [
        { stageId: 'lp', kind: 'filter', change: 'changed', field: 'params.cutoff', before: 200_000, after: 180_000 },
        { stageId: 'dec', kind: 'decimate', change: 'changed', field: 'params.factor', before: 8, after: 4 },
      ],
    });
    expect((await engineer.get(`/api/chains/${id}/diff?from=3&to=3`)).body.changes).toEqual([]);
    expect((await engineer.get(`/api/chains/${id}/diff?from=1&to=999`)).status).toBe(404);
    const bad = await engineer.get(`/api/chains/${id}/diff?from=one&to=3`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('from');
    expect((await engineer.get(`/api/chains/${id}/diff?to=3`)).body.error).toMatchObject({ code: 'required', field: 'from' });
  });

  it('restores an old revision as a new one, leaving history alone', async () => {
    const original = (await engineer.get(`/api/chains/${id}/revisions/1`)).body;
    const latest = (await engineer.get(`/api/chains/${id}`)).body.latestRevision as number;
    const restored = await engineer.post(`/api/chains/${id}/restore`, { revision: 1 });
    expect(restored.status).toBe(201);
    expect(restored.body).toMatchObject({ revision: latest + 1, message: 'Restored revision 1', hash: original.hash });
    expect(restored.body.document).toEqual(original.document);
    expect((await engineer.get(`/api/chains/${id}/revisions/1`)).body).toEqual(original);
    expect((await engineer.get(`/api/chains/${id}/diff?from=1&to=${latest + 1}`)).body.changes).toEqual([]);
    expect((await engineer.post(`/api/chains/${id}/restore`, { revision: 999 })).status).toBe(404);
    expect((await engineer.get(`/api/chains/${id}`)).body.latestRevision).toBe(latest + 1);
  });

  it('exports the exact document of a revision and imports it back unchanged', async () => {
    const revision1 = (await engineer.get(`/api/chains/${id}/revisions/1`)).body;
    const exported = await engineer.get(`/api/chains/${id}/export?revision=1`);
    expect(exported.status).toBe(200);
    expect(exported.headers.get('content-type')).toMatch(/^application\/json/);
    expect(exported.headers.get('content-disposition')).toBe('attachment; filename="revisioned-chain-r1.chain.json"');
    expect(JSON.parse(exported.text)).toEqual(revision1.document);
    expect(exported.body).toEqual(revision1.document);

    const latest = await engineer.get(`/api/chains/${id}/export`);
    const latestNumber = (await engineer.get(`/api/chains/${id}`)).body.latestRevision;
    expect(latest.headers.get('content-disposition')).toContain(`-r${latestNumber}.chain.json`);
    expect((await engineer.get(`/api/chains/${id}/export?revision=abc`)).status).toBe(400);

    // Import = POST /api/chains with the file's document; without a name the document's own is used.
    const imported = await engineer.post('/api/chains', { document: JSON.parse(exported.text), visibility: 'private' });
    expect(imported.status).toBe(201);
    const copy = (await engineer.get(`/api/chains/${imported.body.id}`)).body;
    expect(copy.name).toBe('Test down-conversion');
    expect(copy.revision.document).toEqual(revision1.document);
    expect(copy.revision.hash).toBe(revision1.hash);
    const reexported = await engineer.get(`/api/chains/${imported.body.id}/export`);
    expect(reexported.text).toBe(exported.text);
  });
});

describe('bad documents', () => {
  let id: string;
  beforeAll(async () => {
    id = await createChain(engineer, { name: 'Target of bad saves' });
  });

  function broken(edit: (document: ReturnType<typeof downConversion>) => void) {
    const document = downConversion();
    edit(document);
    return document;
  }

  const cases: Array<[string, unknown, string, RegExp]> = [
    ['unknown kind', broken((d) => (d.stages[1]!.kind = 'filtre')), 'document.stages[1].kind', /stages\[1\] \(id "lp", filtre\).*did you mean "filter"/],
    ['out-of-range parameter', broken((d) => (d.stages[2]!.params.factor = 1)), 'document.stages[2].params.factor', /stages\[2\] \(id "dec", decimate\): factor: must be >= 2/],
    ['duplicate stage id', broken((d) => (d.stages[3]!.id = 'nco')), 'document.stages[3].id', /duplicate stage id "nco"/],
    ['unknown parameter', broken((d) => (d.stages[1]!.params.cutof = 1)), 'document.stages[1].params.cutof', /id "lp", filter\): cutof: unknown parameter/],
    ['negative cut-off', broken((d) => (d.stages[1]!.params.cutoff = -5)), 'document.stages[1].params.cutoff', /id "lp", filter\): cutoff: must be > 0 Hz/],
    ['wrong version', broken((d) => ((d as { version: number }).version = 2)), 'document.version', /version: must be 1/],
    ['not an object', [1, 2], 'document', /must be a JSON object/],
  ];

  it.each(cases)('%s: 422 invalid_chain naming the field, nothing written', async (_, document, field, message) => {
    const chains = await countRows(server.db, 'chains');
    const revisions = await countRows(server.db, 'chain_revisions');
    const created = await engineer.post('/api/chains', { name: 'Should not exist', visibility: 'private', document });
    expect(created.status).toBe(422);
    expect(created.body.error).toMatchObject({ code: 'invalid_chain', field });
    expect(created.body.error.message).toMatch(message);
    const saved = await engineer.post(`/api/chains/${id}/revisions`, { document, message: 'broken' });
    expect(saved.status).toBe(422);
    expect(saved.body.error).toMatchObject({ code: 'invalid_chain', field });
    expect(await countRows(server.db, 'chains')).toBe(chains);
    expect(await countRows(server.db, 'chain_revisions')).toBe(revisions);
  });

  it('names the stage at fault as fields of the error, by position, also when its id is a duplicate', async () => {
    const duplicate = await engineer.post(`/api/chains/${id}/revisions`, { document: broken((d) => (d.stages[3]!.id = 'nco')), message: 'broken' });
    expect(duplicate.status).toBe(422);
    // Stage 3 took the id of stage 0: the index, not the id, says which one is at fault.
    expect(apiErrorBodySchema.parse(duplicate.body).error).toMatchObject({ code: 'invalid_chain', stageIndex: 3, stageId: 'nco' });
    const version = await engineer.post(`/api/chains/${id}/revisions`, { document: broken((d) => ((d as { version: number }).version = 2)), message: 'broken' });
    expect(apiErrorBodySchema.parse(version.body).error.stageIndex).toBeUndefined();
  });

  it('answers 400 for malformed JSON, an overlong name, a missing document or an unknown field', async () => {
    const chains = await countRows(server.db, 'chains');
    const revisions = await countRows(server.db, 'chain_revisions');
    const malformed = await engineer.post('/api/chains', undefined, { raw: '{"name": "x", "document": {' });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.code).toBe('invalid_json');
    expect((await engineer.post(`/api/chains/${id}/revisions`, undefined, { raw: '{"document": [' })).body.error.code).toBe('invalid_json');
    const overlong = await engineer.post('/api/chains', { name: 'n'.repeat(201), visibility: 'private', document: downConversion() });
    expect(overlong.status).toBe(400);
    expect(overlong.body.error).toMatchObject({ code: 'too_long', field: 'name' });
    const missing = await engineer.post(`/api/chains/${id}/revisions`, { message: 'no document' });
    expect(missing.body.error).toMatchObject({ code: 'required', field: 'document' });
    const longMessage = await engineer.post(`/api/chains/${id}/revisions`, { document: downConversion(), message: 'm'.repeat(501) });
    expect(longMessage.body.error).toMatchObject({ code: 'too_long', field: 'message' });
    const unknown = await engineer.post('/api/chains', { name: 'x', visibility: 'private', document: downConversion(), owner: 'someone' });
    expect(unknown.body.error).toMatchObject({ code: 'unknown_field', field: 'owner' });
    const nameless = await engineer.post('/api/chains', { visibility: 'private', document: { ...downConversion(), name: '' } });
    expect(nameless.body.error).toMatchObject({ code: 'required', field: 'name' });
    expect(await countRows(server.db, 'chains')).toBe(chains);
    expect(await countRows(server.db, 'chain_revisions')).toBe(revisions);
  });
});

describe('demo chains', () => {
  it.each(['Beacon down-conversion', 'Front-end balance check'])('%s is seeded as a team chain of the engineer and runs on the demo captures', async (name) => {
    const operator = await signedIn(server, 'operator@saltmarsh.test');
    const found = await operator.get(`/api/chains?q=${encodeURIComponent(name)}`);
    const summary = found.body.items.find((chain: { name: string }) => chain.name === name);
    expect(summary).toMatchObject({ visibility: 'team', owner: { name: 'Teodor Lindqvist' }, latestRevision: 1 });
    const chain = (await operator.get(`/api/chains/${summary.id}`)).body;
    const parsed = parseChainDocument(chain.revision.document);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    // The demo beacon captures: complex I/Q at 4 Msps (src/dsp/synth/demo.ts).
    const propagation = propagateChain(parsed.document, { sampleRate: 4e6, sampleType: 'complex' });
    expect(propagation.flatMap((stage) => stage.issues)).toEqual([]);
    expect(parsed.document.stages.some((stage) => stage.probe && stage.kind === 'spectrum')).toBe(true);
    expect(parsed.document.stages.some((stage) => stage.probe && stage.kind === 'measure')).toBe(true);
  });

  it('brings the beacon to 0 Hz at 500 ksps in the down-conversion chain', async () => {
    const found = await engineer.get('/api/chains?q=Beacon%20down-conversion');
    const chain = (await engineer.get(`/api/chains/${found.body.items[0].id}`)).body;
    const stages = chain.revision.document.stages as Array<{ kind: string; params: Record<string, unknown> }>;
    expect(stages.map((stage) => stage.kind)).toEqual(['dc-remove', 'iq-correct', 'mix', 'filter', 'decimate', 'spectrum', 'measure']);
    // The beacon sits 600 kHz above the LO in the demo captures: a -600 kHz shift moves it to 0 Hz.
    expect(stages[2]!.params.frequency).toBe(-600_000);
    const parsed = parseChainDocument(chain.revision.document);
    if (!parsed.ok) throw new Error('demo chain invalid');
    const output = propagateChain(parsed.document, { sampleRate: 4e6, sampleType: 'complex' }).at(-1)!.output;
    expect(output).toMatchObject({ sampleRate: 500_000, sampleType: 'complex' });
  });
});
