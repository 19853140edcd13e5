/**
 * Who sees and changes which capture (private captures of others are 404, team captures of others
 * are read-only except for admins), the list's filters, sort and paging, edits, deletes, bulk
 * delete and the exports.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { download, sampleBytes, send, sha256, signedIn, storedObjects, upload } from './captures-helpers';

let server: TestServer;
let admin: Client;
let engineer: Client;
let operator: Client;
/** Capture ids by name. */
const ids: Record<string, string> = {};

async function add(client: Client, name: string, params: Record<string, string | number>, samples = 1_000): Promise<string> {
  const datatype = String(params.datatype ?? 'ci16_le');
  const layout = (params.layout ?? (datatype.startsWith('c') ? 'complex' : 'real')) as 'complex' | 'real' | 'real-pair';
  const created = await upload(client, sampleBytes(datatype, layout, samples), { name, datatype, sample_rate: 1e6, ...params });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  ids[name] = created.body.id;
  return created.body.id;
}

beforeAll(async () => {
  process.env.QUADRILLE_DEMO_CAPTURES = '0';
  server = await startServer();
  [admin, engineer, operator] = await Promise.all(
    ['admin@saltmarsh.test', 'engineer@saltmarsh.test', 'operator@saltmarsh.test'].map((email) => signedIn(server, email)),
  );
  await add(engineer, 'Rev A beacon', { visibility: 'team', tags: 'rev-a,beacon', sample_rate: 4e6 }, 4_000);
  await add(engineer, 'Rev B beacon', { visibility: 'team', tags: 'rev-b,beacon', sample_rate: 4e6 }, 2_000);
  await add(engineer, 'engineer private notes', { notes: 'not for the team', datatype: 'rf32_le', sample_rate: 48e3 }, 500);
  await add(engineer, 'IF real capture', { visibility: 'team', datatype: 'ri16_be', layout: 'real-pair', sample_rate: 40e6 }, 3_000);
});
afterAll(async () => {
  await server?.stop();
});

describe('visibility and permissions', () => {
  it('another user, even an admin, gets 404 for a private capture and everything under it', async () => {
    for (const client of [operator, admin]) {
      for (const path of ['', '/data', '/export?format=sigmf-meta']) {
        const response = await client.get(`/api/captures/${ids['engineer private notes']}${path}`);
        expect(response.status, path).toBe(404);
      }
      expect((await client.patch(`/api/captures/${ids['engineer private notes']}`, { name: 'x' })).status).toBe(404);
      expect((await client.request('DELETE', `/api/captures/${ids['engineer private notes']}`)).status).toBe(404);
    }
    const listed = (await operator.get('/api/captures?pageSize=100')).body.items.map((item: { name: string }) => item.name);
    expect(listed).not.toContain('engineer private notes');
  });

  it('an operator reads a team capture of someone else but may neither edit nor delete it (403)', async () => {
    const id = ids['Rev A beacon']!;
    const read = await operator.get(`/api/captures/${id}`);
    expect(read.status).toBe(200);
    expect(read.body.permissions).toEqual({ update: false, delete: false });
    expect((await operator.patch(`/api/captures/${id}`, { name: 'mine now' })).status).toBe(403);
    const refused = await operator.request('DELETE', `/api/captures/${id}`);
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('forbidden');
    expect((await engineer.get(`/api/captures/${id}`)).body.name).toBe('Rev A beacon');
  });

  it('an engineer cannot delete the operator team capture (403); an admin can (204), and the bytes go', async () => {
    const id = await add(operator, 'operator field capture', { visibility: 'team', datatype: 'cu8', sample_rate: 2.4e6, tags: 'field' }, 800);
    expect((await engineer.request('DELETE', `/api/captures/${id}`)).status).toBe(403);
    expect((await admin.get(`/api/captures/${id}`)).body.permissions).toEqual({ update: true, delete: true });
    expect((await admin.request('DELETE', `/api/captures/${id}`)).status).toBe(204);
    expect((await operator.get(`/api/captures/${id}`)).status).toBe(404);
    expect(storedObjects(server)).not.toContain(`captures/${id}`);
  });

  it('answers 401 without a session and 404 for a malformed id', async () => {
    const anonymous = await fetch(`${server.baseUrl}/api/captures`);
    expect(anonymous.status).toBe(401);
    expect((await engineer.get('/api/captures/not-a-capture')).status).toBe(404);
  });
});

describe('editing', () => {
  // A capture of this describe's own, gone again afterwards: the list tests read the shared ones unedited.
  let id: string;
  beforeAll(async () => {
    id = await add(engineer, 'Rev C beacon', { visibility: 'team', tags: 'rev-c,beacon', sample_rate: 4e6 }, 2_000);
  });
  afterAll(async () => {
    expect((await engineer.request('DELETE', `/api/captures/${id}`)).status).toBe(204);
  });

  it('the owner changes name, notes, tags, visibility, centre frequency and annotations', async () => {
    const annotations = [{ 'core:sample_start': 10, 'core:sample_count': 100, 'core:label': 'burst', 'core:freq_lower_edge': -1e5, 'core:freq_upper_edge': 1e5 }];
    const response = await engineer.patch(`/api/captures/${id}`, {
      name: 'Rev C beacon, bench 2',
      notes: 'LO at 2.412 GHz',
      tags: ['rev-c', 'bench-2'],
      visibility: 'private',
      centerFrequency: 2.412e9,
      annotations,
    });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    expect(response.body).toMatchObject({ name: 'Rev C beacon, bench 2', notes: 'LO at 2.412 GHz', tags: ['rev-c', 'bench-2'], visibility: 'private', centerFrequency: 2.412e9, annotations });
    expect((await operator.get(`/api/captures/${id}`)).status).toBe(404);
    expect((await engineer.patch(`/api/captures/${id}`, { visibility: 'team', centerFrequency: null })).body).toMatchObject({ visibility: 'team', centerFrequency: null });
  });

  it('refuses bad edits naming the field, changing nothing', async () => {
    const before = await server.db('captures').where({ id }).first();
    const cases: Array<[object, number, string]> = [
      [{ name: '' }, 400, 'name'],
      [{ visibility: 'public' }, 400, 'visibility'],
      [{ centerFrequency: 'Infinity' }, 400, 'centerFrequency'],
      [{ tags: 'a'.repeat(41) }, 400, 'tags'],
      [{ annotations: [{ 'core:label': 'no start' }] }, 400, 'annotations[0].core:sample_start'],
      [{ annotations: [{ 'core:sample_start': 1_990, 'core:sample_count': 20 }] }, 422, 'annotations[0].core:sample_count'],
      [{ datatype: 'cf32_le' }, 400, 'datatype'],
      [{}, 400, null as unknown as string],
    ];
    for (const [body, status, field] of cases) {
      const response = await engineer.patch(`/api/captures/${id}`, body);
      expect(response.status, JSON.stringify(body)).toBe(status);
      expect(response.body.error.field).toBe(field);
    }
    expect(await server.db('captures').where({ id }).first()).toEqual(before);
  });
});

describe('list', () => {
  const names = async (client: Client, query: string) =>
    ((await client.get(`/api/captures?${query}`)).body.items as { name: string }[]).map((item) => item.name);

  it('filters by owner, tag, text, layout, datatype and rate', async () => {
    expect(await names(operator, 'owner=me')).toEqual([]);
    expect((await names(engineer, 'owner=me&sort=name&order=asc')).length).toBe(4);
    expect(await names(operator, 'tag=beacon&sort=name&order=asc')).toEqual(['Rev A beacon', 'Rev B beacon']);
    expect(await names(operator, 'tag=rev-b')).toEqual(['Rev B beacon']);
    expect(await names(operator, 'q=BEACON&sort=name&order=asc')).toEqual(['Rev A beacon', 'Rev B beacon']);
    expect(await names(engineer, 'q=team')).toEqual(['engineer private notes']);
    expect(await names(engineer, 'q=100%25')).toEqual([]);
    expect(await names(engineer, 'layout=real-pair')).toEqual(['IF real capture']);
    expect(await names(engineer, 'datatype=rf32_le')).toEqual(['engineer private notes']);
    expect(await names(engineer, 'minRate=1e6&maxRate=5e6&sort=name&order=asc')).toEqual(['Rev A beacon', 'Rev B beacon']);
    const engineerId = (await engineer.get('/api/me')).body.id;
    expect((await names(operator, `owner=${engineerId}`)).sort()).toEqual(['IF real capture', 'Rev A beacon', 'Rev B beacon']);
  });

  it('sorts, pages and reports usage against the quota', async () => {
    const bySize = await engineer.get('/api/captures?sort=byteSize&order=desc&pageSize=2&page=1');
    expect(bySize.body.total).toBe(4);
    expect(bySize.body.items.map((item: { name: string }) => item.name)).toEqual(['Rev A beacon', 'IF real capture']);
    const second = await engineer.get('/api/captures?sort=byteSize&order=desc&pageSize=2&page=2');
    expect(second.body.items.map((item: { name: string }) => item.name)).toEqual(['Rev B beacon', 'engineer private notes']);
    expect(second.body).toMatchObject({ page: 2, pageSize: 2 });
    const stored = 4_000 * 4 + 2_000 * 4 + 500 * 4 + 3_000 * 4;
    // Default quota from configuration: 32 GiB of storage, 8 GiB per capture.
    expect(bySize.body.usage).toEqual({ storedBytes: stored, captureCount: 4, quotaBytes: 32 * 1024 ** 3, largestCaptureBytes: 8 * 1024 ** 3 });
  });

  it('refuses bad list parameters naming them', async () => {
    for (const [query, field] of [['sort=colour', 'sort'], ['pageSize=1000', 'pageSize'], ['page=0', 'page'], ['color=red', 'color'], ['layout=stereo', 'layout']]) {
      const response = await engineer.get(`/api/captures?${query}`);
      expect(response.status, query).toBe(400);
      expect(response.body.error.field).toBe(field);
    }
  });
});

describe('exports', () => {
  let work: string;
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'quadrille-export-test-'));
  });
  afterAll(() => rmSync(work, { recursive: true, force: true }));

  it('sigmf-meta follows SigMF 1.2 core fields', async () => {
    const response = await send(engineer, 'GET', `/api/captures/${ids['IF real capture']}/export?format=sigmf-meta`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-disposition')).toMatch(/filename="IF-real-capture\.sigmf-meta"/);
    // SigMF v1.2.0 (GNU Radio Foundation): global core:datatype/core:version required, captures with core:sample_start.
    expect(response.body.global).toMatchObject({ 'core:datatype': 'ri16_be', 'core:version': '1.2.0', 'core:sample_rate': 40e6, 'core:num_channels': 2, 'core:author': 'Teodor Lindqvist' });
    expect(response.body.global['core:sha512']).toBeUndefined();
    expect(response.body.captures).toEqual([{ 'core:sample_start': 0 }]);
  });

  it('a .sigmf archive that tar lists and extracts into the meta and the identical data', async () => {
    const id = ids['Rev A beacon']!;
    const response = await send(engineer, 'GET', `/api/captures/${id}/export?format=sigmf`);
    expect(response.status).toBe(200);
    expect(Number(response.headers.get('content-length'))).toBe(response.bytes.length);
    writeFileSync(join(work, 'a.sigmf'), response.bytes);
    // GNU tar reads the archive (POSIX ustar): a folder holding the meta first, then the data.
    const listing = execFileSync('tar', ['-tf', join(work, 'a.sigmf')], { encoding: 'utf8' }).trim().split('\n');
    expect(listing).toEqual(['Rev-A-beacon/', 'Rev-A-beacon/Rev-A-beacon.sigmf-meta', 'Rev-A-beacon/Rev-A-beacon.sigmf-data']);
    execFileSync('tar', ['-xf', join(work, 'a.sigmf'), '-C', work]);
    const data = readFileSync(join(work, 'Rev-A-beacon/Rev-A-beacon.sigmf-data'));
    expect(sha256(data)).toBe((await engineer.get(`/api/captures/${id}`)).body.sha256);
    const meta = JSON.parse(readFileSync(join(work, 'Rev-A-beacon/Rev-A-beacon.sigmf-meta'), 'utf8'));
    expect(meta.global['core:datatype']).toBe('ci16_le');
    // What we export uploads again as the same capture: a duplicate.
    const again = await upload(engineer, new Uint8Array(response.bytes), { format: 'sigmf' });
    expect(again.status).toBe(409);
    expect(again.body.capture.id).toBe(id);
  });

  it('WAV of a big-endian real-pair capture holds the samples little-endian behind a RIFF header', async () => {
    const id = ids['IF real capture']!;
    const response = await send(engineer, 'GET', `/api/captures/${id}/export?format=wav`);
    expect(response.status).toBe(200);
    const wav = Buffer.from(response.bytes);
    // RIFF/WAVE (Microsoft/IBM 1991): "RIFF" size "WAVE", fmt chunk (tag 1 = PCM, channels, rate,
    // byte rate, block align, bits), then "data" size and the samples, 16-bit little-endian.
    expect(wav.toString('ascii', 0, 4)).toBe('RIFF');
    expect(wav.readUInt32LE(4)).toBe(wav.length - 8);
    expect(wav.toString('ascii', 8, 16)).toBe('WAVEfmt ');
    expect([wav.readUInt16LE(20), wav.readUInt16LE(22), wav.readUInt32LE(24), wav.readUInt16LE(32), wav.readUInt16LE(34)]).toEqual([1, 2, 40e6, 4, 16]);
    expect(wav.toString('ascii', 36, 40)).toBe('data');
    const original = Buffer.from(await download(engineer, id));
    expect(wav.readUInt32LE(40)).toBe(original.length);
    const swapped = Buffer.from(original).swap16();
    expect(wav.subarray(44).equals(swapped)).toBe(true);
  });

  it('refuses WAV for a complex capture and an unknown format, naming format', async () => {
    const complex = await engineer.get(`/api/captures/${ids['Rev A beacon']}/export?format=wav`);
    expect(complex.status).toBe(422);
    expect(complex.body.error).toMatchObject({ code: 'not_exportable', field: 'format' });
    expect((await engineer.get(`/api/captures/${ids['Rev A beacon']}/export?format=mp3`)).body.error.field).toBe('format');
  });
});

describe('bulk delete', () => {
  it('deletes what the user may and lists the rest with the reason', async () => {
    const mine = await add(operator, 'operator scratch', { datatype: 'ci8' }, 10);
    const response = await operator.post('/api/captures/bulk-delete', {
      ids: [mine, ids['Rev A beacon'], ids['engineer private notes'], '00000000-0000-4000-8000-000000000000'],
    });
    expect(response.status).toBe(200);
    expect(response.body).toEqual({
      deleted: [mine],
      refused: [
        { id: ids['Rev A beacon'], code: 'forbidden' },
        { id: ids['engineer private notes'], code: 'not_found' },
        { id: '00000000-0000-4000-8000-000000000000', code: 'not_found' },
      ],
    });
    expect(storedObjects(server)).not.toContain(`captures/${mine}`);
    expect((await operator.post('/api/captures/bulk-delete', { ids: [] })).body.error.field).toBe('ids');
  });

  it('lets an engineer delete its own capture: row and bytes go', async () => {
    const id = await add(engineer, 'engineer scratch', { datatype: 'ci8' }, 10);
    expect((await engineer.request('DELETE', `/api/captures/${id}`)).status).toBe(204);
    expect(await server.db('captures').where({ id }).first()).toBeUndefined();
    expect(storedObjects(server)).not.toContain(`captures/${id}`);
  });
});
