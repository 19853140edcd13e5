/**
 * The runs module against a real SQLite database (no server): each list query is served by an
 * index in its ORDER BY (EXPLAIN QUERY PLAN), keyset pages walk the list without gaps or repeats,
 * and submission, comparison, quotas and capture look-ups cost the same number of queries whatever
 * the number of items (knex's `query` event counts them).
 */
import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Actor } from '@/lib/permissions';
import { openDb } from '@/lib/server/db';
import { migrateToLatest } from '@/lib/server/db/migration-source';
import { findCaptures } from '@/lib/server/captures/rows';
import { deleteCaptures } from '@/lib/server/captures/update';
import { quotasOf } from '@/lib/server/quota';
import { loadRunsFor } from '@/lib/server/runs/access';
import { loadComparedRuns } from '@/lib/server/runs/compare';
import { filteredRuns, listRuns, newestFirst } from '@/lib/server/runs/list';
import { submitRuns } from '@/lib/server/runs/submit';
import type { ObjectStore } from '@/lib/server/storage';

let folder: string;
let db: Knex;
const admin: Actor = { id: randomUUID(), role: 'admin' };
const engineer: Actor = { id: randomUUID(), role: 'engineer' };
const chainId = randomUUID();
/** The chain of the 30 listed runs only, so runs other tests submit never join the list under test. */
const listChainId = randomUUID();
const captureIds: string[] = [];
const runIds: string[] = [];
const now = Date.parse('2026-12-01T00:00:00Z');

function iso(offsetSeconds: number): string {
  return new Date(now + offsetSeconds * 1000).toISOString();
}

beforeAll(async () => {
  folder = mkdtempSync(join(tmpdir(), 'quadrille-runs-db-'));
  db = openDb(folder);
  await migrateToLatest(db);
  for (const [user, email] of [[admin, 'admin@runs.test'], [engineer, 'engineer@runs.test']] as const) {
    await db('users').insert({ id: user.id, email, name: email, role: user.role, password_hash: 'x', created_at: iso(0), updated_at: iso(0) });
  }
  const document = { version: 1, name: 'Gain', stages: [{ id: 'g', kind: 'gain', params: { gainDb: 3 } }, { id: 'psd', kind: 'spectrum', params: { fftSize: 256 }, probe: true }] };
  await db('chains').insert({ id: chainId, owner_id: engineer.id, name: 'Gain', visibility: 'team', latest_revision: 1, created_at: iso(0), updated_at: iso(0) });
  await db('chain_revisions').insert({ id: randomUUID(), chain_id: chainId, revision: 1, document: JSON.stringify(document), author_id: engineer.id, hash: 'h'.repeat(64), created_at: iso(0) });
  for (let i = 0; i < 12; i++) {
    const id = randomUUID();
    captureIds.push(id);
    await db('captures').insert({
      id, owner_id: engineer.id, name: `Capture ${i}`, visibility: 'team', sample_rate: 1e6, center_frequency: null, datatype: 'cf32_le', layout: 'complex',
      sample_count: 1000, byte_size: 8000, sha256: i.toString(16).padStart(64, '0'), storage_key: `captures/${id}`, source: 'upload', created_at: iso(i), updated_at: iso(i),
    });
  }
  // 30 runs, several sharing a creation time, so the id has to break ties.
  for (let i = 0; i < 30; i++) {
    const id = randomUUID();
    runIds.push(id);
    await db('runs').insert({
      id, requested_by: engineer.id, chain_id: listChainId, chain_revision: 1, chain_name: 'Gain', capture_id: captureIds[i % 3], capture_name: 'c',
      cache_key: 'k'.repeat(64), status: 'failed', progress: 0, created_at: iso(100 + Math.floor(i / 3)),
    });
  }
  // The first ten runs succeeded, sharing one cached result with a summary and a spectrum preview.
  const resultId = randomUUID();
  const spectrum = { probe: 'psd', stageKind: 'spectrum', kind: 'spectrum', format: { sampleRate: 1e6, sampleType: 'complex' }, width: 2, bins: 2, unit: 'dBFS', peak: { frequency: 0, level: -3 }, resolutionBandwidth: 1, segments: 1, frequencies: [0, 1], levels: [-3, -90] };
  const summary = { testPoints: [{ stageId: 'psd', kind: 'spectrum', format: spectrum.format, plots: ['spectrum'], readouts: [{ name: 'Tone', value: -3, unit: 'dBFS' }] }] };
  await db('run_results').insert({
    id: resultId, cache_key: 'r'.repeat(64), chain_hash: 'c'.repeat(64), capture_sha256: '0'.repeat(64), engine_version: '1', results: '{}', summary: JSON.stringify(summary),
    output_key: 'run-outputs/x/data', output_meta: '{}', output_bytes: 0, output_samples: 0, compute_seconds: 0, created_at: iso(0),
  });
  await db('run_probe_data').insert({ result_id: resultId, stage_id: 'psd', kind: 'spectrum', data: JSON.stringify(spectrum), preview: JSON.stringify(spectrum) });
  await db('runs').whereIn('id', runIds.slice(0, 10)).update({ status: 'succeeded', result_id: resultId });
});

afterAll(async () => {
  await db?.destroy();
  rmSync(folder, { recursive: true, force: true });
});

/** The plan's detail lines of a query. */
async function plan(query: Knex.QueryBuilder): Promise<string[]> {
  const { sql, bindings } = query.toSQL().toNative();
  const rows = (await db.raw(`EXPLAIN QUERY PLAN ${sql}`, bindings as readonly Knex.RawBinding[])) as { detail: string }[];
  return rows.map((row) => row.detail);
}

/** How many statements `work` sends to the database. */
async function countQueries(work: () => Promise<unknown>): Promise<number> {
  let count = 0;
  const listener = () => count++;
  db.on('query', listener);
  try {
    await work();
  } finally {
    db.removeListener('query', listener);
  }
  return count;
}

describe('runs list query plans', () => {
  const cases: [string, Parameters<typeof filteredRuns>[2], string][] = [
    ['the whole queue', { all: true, mine: false, statuses: [] }, 'runs_created_at_id_index'],
    ['one capture', { all: true, mine: false, statuses: [], captureId: 'c' }, 'runs_capture_id_created_at_index'],
    ['one chain', { all: true, mine: false, statuses: [], chainId: 'c' }, 'runs_chain_id_created_at_index'],
  ];
  for (const [name, filters, index] of cases) {
    it(`reads ${name} newest first through ${index}, without a sort`, async () => {
      const details = await plan(newestFirst(filteredRuns(db, admin, filters)).limit(50));
      const runsStep = details.find((detail) => /^(SCAN|SEARCH) runs\b/.test(detail));
      expect(runsStep, details.join('\n')).toContain(`USING INDEX ${index}`);
      expect(details.join('\n')).not.toMatch(/TEMP B-TREE/);
      expect(details.some((detail) => /^SCAN runs$/.test(detail))).toBe(false);
      // A keyset page starts inside the index rather than scanning up to the offset.
      const keyset = await plan(newestFirst(filteredRuns(db, admin, filters)).whereRaw('(runs.created_at, runs.id) < (?, ?)', [iso(105), runIds[0]]).limit(50));
      expect(keyset.join('\n')).not.toMatch(/TEMP B-TREE/);
      expect(keyset.find((detail) => /^(SCAN|SEARCH) runs\b/.test(detail))).toContain(`USING INDEX ${index}`);
    });
  }
});

describe('keyset paging', () => {
  it('walks every run once, newest first, with ties broken by id', async () => {
    const seen: string[] = [];
    let cursor: string | undefined;
    for (let pages = 0; pages < 10; pages++) {
      const page = await listRuns(db, admin, { all: true, mine: false, statuses: [], page: 1, pageSize: 7, cursor, chainId: listChainId });
      expect(page.total).toBe(30);
      seen.push(...page.items.map((run) => run.id));
      if (!page.nextCursor) break;
      cursor = page.nextCursor;
    }
    const expected = (await db('runs').where({ chain_id: listChainId }).select('id', 'created_at')) as { id: string; created_at: string }[];
    expected.sort((a, b) => (a.created_at === b.created_at ? (a.id < b.id ? 1 : -1) : a.created_at < b.created_at ? 1 : -1));
    expect(seen).toEqual(expected.map((row) => row.id));
  });

  it('gives the same second page by cursor as by page number', async () => {
    const first = await listRuns(db, admin, { all: true, mine: false, statuses: [], page: 1, pageSize: 10, chainId: listChainId });
    const byCursor = await listRuns(db, admin, { all: true, mine: false, statuses: [], page: 1, pageSize: 10, cursor: first.nextCursor!, chainId: listChainId });
    const byNumber = await listRuns(db, admin, { all: true, mine: false, statuses: [], page: 2, pageSize: 10, chainId: listChainId });
    expect(byCursor.items.map((run) => run.id)).toEqual(byNumber.items.map((run) => run.id));
  });

  it('refuses a cursor it did not give out with 400 naming the field', async () => {
    await expect(listRuns(db, admin, { all: true, mine: false, statuses: [], page: 1, pageSize: 10, cursor: 'nonsense' })).rejects.toMatchObject({ status: 400, field: 'cursor' });
  });
});

describe('queries per request', () => {
  it('submits runs on 1 or 10 captures with the same number of queries', async () => {
    const request = (ids: string[]) => ({ chainId, captureIds: ids, captureField: (i: number) => `capture_ids.${i}` });
    const one = await countQueries(() => submitRuns(db, engineer, request(captureIds.slice(0, 1))));
    const ten = await countQueries(() => submitRuns(db, engineer, request(captureIds.slice(1, 11))));
    expect(ten).toBe(one);
  });

  it('reads the quotas of 1 or 5 users in one query', async () => {
    expect(await countQueries(() => quotasOf(db, [engineer.id]))).toBe(1);
    expect(await countQueries(() => quotasOf(db, [engineer.id, admin.id, 'a', 'b', 'c']))).toBe(1);
  });

  it('loads 2 or 8 compared runs with the same number of queries', async () => {
    let compared: Awaited<ReturnType<typeof loadComparedRuns>> = [];
    const two = await countQueries(async () => loadComparedRuns(db, await loadRunsFor(db, engineer, runIds.slice(0, 2), 'ids')));
    const eight = await countQueries(async () => (compared = await loadComparedRuns(db, await loadRunsFor(db, engineer, runIds.slice(2, 10), 'ids'))));
    expect(eight).toBe(two);
    // The runs, their summaries, their spectra.
    expect(two).toBe(3);
    expect(compared.map((run) => run.runId)).toEqual(runIds.slice(2, 10));
    expect(compared[0]!.spectra[0]!.levels).toEqual([-3, -90]);
  });

  it('finds and deletes 1 or 4 captures with the same number of queries', async () => {
    const store = { delete: async () => undefined } as unknown as ObjectStore;
    const bulk = async (ids: string[]) => deleteCaptures(db, store, [...(await findCaptures(db, ids)).values()]);
    const one = await countQueries(() => bulk([captureIds[11]!]));
    const extra = [randomUUID(), randomUUID(), randomUUID(), randomUUID()];
    for (const [i, id] of extra.entries()) {
      await db('captures').insert({
        id, owner_id: engineer.id, name: `Extra ${i}`, visibility: 'team', sample_rate: 1e6, datatype: 'cf32_le', layout: 'complex',
        sample_count: 1, byte_size: 8, sha256: `e${i}`.padStart(64, 'e'), storage_key: `captures/${id}`, source: 'upload', created_at: iso(0), updated_at: iso(0),
      });
    }
    const four = await countQueries(() => bulk(extra));
    expect(four).toBe(one);
    expect(await db('captures').whereIn('id', extra).count({ n: '*' }).first()).toEqual({ n: 0 });
  });
});
