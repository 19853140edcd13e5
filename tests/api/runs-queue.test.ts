/**
 * Queue semantics against the built server with one run at a time: the concurrency limit, cancel of
 * a running worker, failure with stage and sample and its retry, the result cache (hit and miss),
 * and users taking turns.
 */
import { createHash } from 'node:crypto';
import { readdirSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENGINE_VERSION } from '@/dsp/version';
import { cacheKey, computationHash } from '@/lib/server/runs/cache-key';
import { utcDay } from '@/lib/server/runs/transitions';
import type { Client } from '../helpers/client';
import {
  blindIqChain, complexTone, createChain, finished, quickChain, signedIn, slowChain, startRunsServer, submitRun, synthCapture,
  uploadCapture, waitForRun, type RunsServer,
} from './runs-helpers';

let server: RunsServer;
let engineer: Client;
let operator: Client;
let bigCapture: string;
let smallCapture: string;

/** Keys of stored run outputs (objects under run-outputs/). */
function storedOutputs(): string[] {
  const root = join(server.dataDir, 'objects', 'run-outputs');
  if (!existsSync(root)) return [];
  return readdirSync(root).filter((name) => !name.startsWith('.')).filter((name) => existsSync(join(root, name, 'data')));
}

beforeAll(async () => {
  server = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '1' } });
  engineer = await signedIn(server.baseUrl, 'engineer@saltmarsh.test');
  operator = await signedIn(server.baseUrl, 'operator@saltmarsh.test');
  bigCapture = await synthCapture(engineer, 'Saltmarsh beacon, long', 0.5);
  smallCapture = await uploadCapture(engineer, 'Saltmarsh beacon, short', complexTone(65_536, 4e6, 500_000), 4e6);
});
afterAll(async () => {
  await server?.stop();
});

describe('concurrency and cancel', () => {
  it('keeps the second run queued while the first runs, and cancel stops a running worker before it finishes', async () => {
    const slow = await createChain(engineer, slowChain());
    const wider = await createChain(engineer, { ...slowChain(), stages: [{ ...slowChain().stages[0]!, params: { design: 'window', response: 'lowpass', cutoff: 300_000, taps: 511 } }, slowChain().stages[1]!] });
    const first = await submitRun(engineer, slow, bigCapture);
    const second = await submitRun(engineer, wider, bigCapture);
    expect(first.status).toBe('queued');
    const running = await waitForRun(engineer, first.id, (run) => run.status === 'running' && run.progress > 0.02, 30_000);
    expect(running.startedAt).not.toBeNull();
    expect(running.etaSeconds === null || running.etaSeconds >= 0).toBe(true);
    // With one slot, the second stays queued however far the first gets.
    await waitForRun(engineer, first.id, (run) => run.status === 'running' && run.progress >= running.progress + 0.02, 60_000);
    expect((await engineer.get(`/api/runs/${second.id}`)).body.status).toBe('queued');
    expect((await engineer.get(`/api/runs/${first.id}`)).body.status).toBe('running');

    // A queued run is cancelled at once.
    const cancelQueued = await engineer.post(`/api/runs/${second.id}/cancel`);
    expect(cancelQueued.status).toBe(202);
    expect(cancelQueued.body.status).toBe('cancelled');

    const cancelRunning = await engineer.post(`/api/runs/${first.id}/cancel`);
    expect(cancelRunning.status).toBe(202);
    const cancelled = await waitForRun(engineer, first.id, finished, 60_000);
    expect(cancelled.status).toBe('cancelled');
    // Stopped part-way: the worker did not run to the end of the capture.
    expect(cancelled.progress).toBeLessThan(1);
    expect(cancelled.summary).toBeUndefined();
    expect(cancelled.permissions).toEqual({ cancel: false, retry: true });
    const row = await server.db('runs').where({ id: first.id }).first();
    expect(row.result_id).toBeNull();
    // The output is deleted before the run is marked cancelled.
    expect(storedOutputs()).toEqual([]);
    // Cancelling again is a conflict, not a second cancel.
    expect((await engineer.post(`/api/runs/${first.id}/cancel`)).status).toBe(409);
  }, 180_000);
});

describe('compute quota at start', () => {
  it('fails a queued run with kind quota when the day\'s compute seconds ran out while it waited', async () => {
    const first = await submitRun(engineer, await createChain(engineer, slowChain()), bigCapture);
    await waitForRun(engineer, first.id, (run) => run.status === 'running', 30_000);
    // A chain no earlier test ran, so no cached result can answer it.
    const waiting = await submitRun(engineer, await createChain(engineer, quickChain(123_456)), smallCapture);
    expect(waiting.status).toBe('queued');
    const user = await server.db('users').where({ email: 'engineer@saltmarsh.test' }).first('id');
    const day = utcDay(new Date());
    await server.db('compute_usage').insert({ user_id: user.id, day, seconds: 1e9 }).onConflict(['user_id', 'day']).merge();
    try {
      await engineer.post(`/api/runs/${first.id}/cancel`);
      const failed = await waitForRun(engineer, waiting.id, finished, 30_000);
      expect(failed.status).toBe('failed');
      expect(failed.error).toMatchObject({ kind: 'quota', stageId: null });
      expect(failed.error.message).toMatch(/compute seconds for today were used up/);
      expect(failed.permissions.retry).toBe(true);
    } finally {
      await server.db('compute_usage').where({ user_id: user.id, day }).delete();
    }
  }, 120_000);
});

describe('failure and retry', () => {
  it('records the failing stage and sample, and a retry is a new attempt', async () => {
    const sameIq = await uploadCapture(engineer, 'I equals Q', complexTone(20_000, 4e6, 300_000, { sameIq: true }), 4e6);
    const chain = await createChain(engineer, blindIqChain(4096));
    const submitted = await submitRun(engineer, chain, sameIq);
    const failed = await waitForRun(engineer, submitted.id, finished);
    expect(failed.status).toBe('failed');
    expect(failed.error).toMatchObject({ stageId: 'iq', kind: 'iq-correct' });
    // The head estimate runs once 4096 samples have arrived: the failing block starts at or before sample 4096.
    expect(failed.error.sampleIndex).toBeGreaterThanOrEqual(0);
    expect(failed.error.sampleIndex).toBeLessThanOrEqual(4096);
    expect(failed.error.message).toMatch(/iq/);
    expect(failed.error.message).toMatch(/sample \d+/);
    expect(failed.summary).toBeUndefined();
    expect(failed.permissions.retry).toBe(true);
    expect(await server.db('run_results').where({ cache_key: (await server.db('runs').where({ id: submitted.id }).first()).cache_key }).first()).toBeUndefined();

    const retried = await engineer.post(`/api/runs/${submitted.id}/retry`);
    expect(retried.status).toBe(202);
    const attempt = retried.body.runs[0];
    expect(attempt.id).not.toBe(submitted.id);
    const second = await waitForRun(engineer, attempt.id, finished);
    expect(second).toMatchObject({ attempt: 2, retryOf: submitted.id, status: 'failed' });
    // Someone else may not retry it, and a succeeded run cannot be retried.
    expect((await operator.post(`/api/runs/${submitted.id}/retry`)).status).toBe(403);
  }, 180_000);
});

describe('result cache', () => {
  it('answers an identical request at once from the cache and misses on a changed parameter', async () => {
    const chain = await createChain(engineer, quickChain(200_000));
    const fresh = await submitRun(engineer, chain, smallCapture);
    expect(fresh.fromCache).toBe(false);
    const done = await waitForRun(engineer, fresh.id, finished);
    expect(done.status).toBe('succeeded');
    expect(done.fromCache).toBe(false);
    expect(done.summary.testPoints.map((point: { stageId: string }) => point.stageId)).toEqual(['psd', 'meas']);

    // Answered at once: the submission's own answer is already succeeded, with no queued state between.
    const again = await engineer.post('/api/runs', { chain_id: chain, capture_id: smallCapture });
    expect(again.status).toBe(202);
    expect(again.body.runs[0]).toMatchObject({ status: 'succeeded', fromCache: true });
    expect(again.body.runs[0].id).not.toBe(fresh.id);
    const cached = (await engineer.get(`/api/runs/${again.body.runs[0].id}`)).body;
    expect(cached.fromCache).toBe(true);
    expect(cached.summary).toEqual(done.summary);

    // Another user asking the same question of a visible chain and capture is answered from the cache too.
    expect((await operator.post('/api/runs', { chain_id: chain, capture_id: smallCapture })).body.runs[0].fromCache).toBe(true);

    // A renamed copy computes the same: still a hit. A changed cut-off: a miss.
    const renamed = await createChain(engineer, { ...quickChain(200_000), name: 'Same computation, other name' });
    expect((await engineer.post('/api/runs', { chain_id: renamed, capture_id: smallCapture })).body.runs[0].fromCache).toBe(true);
    const changed = await engineer.post(`/api/chains/${chain}/revisions`, { document: quickChain(150_000), message: 'narrower' });
    expect(changed.status, changed.text).toBe(201);
    const miss = await submitRun(engineer, chain, smallCapture);
    expect(miss).toMatchObject({ status: 'queued', fromCache: false });
    await waitForRun(engineer, miss.id, finished);

  }, 180_000);

  it('keys a run on the computation-only canonical chain, the capture bytes and the engine version', async () => {
    const samples = complexTone(4096, 4e6, 250_000, { seed: 77 });
    const capture = await uploadCapture(engineer, 'Keyed beacon', samples, 4e6);
    const chain = await createChain(engineer, { version: 1, name: 'Plain gain', stages: [{ id: 'g', kind: 'gain', params: { gainDb: 3 } }] });
    const run = await submitRun(engineer, chain, capture);
    await waitForRun(engineer, run.id, finished);
    const sha256 = (data: string | Uint8Array) => createHash('sha256').update(data).digest('hex');
    // Written by hand from the documented canonical form (src/dsp/chain/canonical.ts: no name,
    // defaults of src/dsp/stages/gain.ts filled in, keys sorted) and key layout (cache-key.ts).
    const canonical =
      '{"version":1,"stages":[{"id":"g","kind":"gain","params":{"estimateSamples":262144,"gainDb":3,"mode":"fixed","targetDb":-20},"probe":false,"bypass":false}]}';
    const captureSha = sha256(new Uint8Array(samples.buffer, samples.byteOffset, samples.byteLength));
    const row = await server.db('runs').where({ id: run.id }).first();
    expect(row.cache_key).toBe(sha256(`quadrille-run\n${sha256(canonical)}\n${captureSha}\n${ENGINE_VERSION}`));
    const result = await server.db('run_results').where({ id: row.result_id }).first();
    expect(result).toMatchObject({ cache_key: row.cache_key, chain_hash: sha256(canonical), capture_sha256: captureSha, engine_version: ENGINE_VERSION });
  }, 180_000);

  it('misses a result stored under another engine version', async () => {
    // A real result of this test's own: a run of another chain on the same capture.
    const own = await submitRun(engineer, await createChain(engineer, quickChain(130_000)), smallCapture);
    const ownRow = await server.db('runs').where({ id: (await waitForRun(engineer, own.id, finished)).id }).first();
    const chain = await createChain(engineer, quickChain(120_000));
    const capture = await server.db('captures').where({ id: smallCapture }).first();
    const result = await server.db('run_results').where({ id: ownRow.result_id }).first();
    // File a copy of a real result under the key the previous engine version would have used.
    await server.db('run_results').insert({
      ...result,
      id: '00000000-0000-4000-8000-0000000000e1',
      cache_key: cacheKey(computationHash(quickChain(120_000)), capture.sha256, '0.9.0'),
      engine_version: '0.9.0',
    });
    const run = await submitRun(engineer, chain, smallCapture);
    expect(run.fromCache).toBe(false);
    await waitForRun(engineer, run.id, finished);
  }, 180_000);
});

describe('fairness', () => {
  it("starts another user's single run before the rest of one user's batch", async () => {
    const slow = await createChain(engineer, slowChain());
    const batchCaptures: string[] = [];
    for (const seed of [11, 12, 13]) batchCaptures.push(await synthCapture(engineer, `Batch capture ${seed}`, 0.05, seed));
    const single = await synthCapture(operator, 'Operator capture', 0.05, 14);
    const batch = await engineer.post('/api/runs', { chain_id: slow, capture_ids: batchCaptures });
    expect(batch.status).toBe(202);
    expect(batch.body.runs).toHaveLength(3);
    const lone = await submitRun(operator, slow, single);
    const all = [...batch.body.runs.map((run: { id: string }) => run.id), lone.id];
    for (const id of all) await waitForRun(engineer, id, finished, 90_000);
    const rows = await server.db('runs').whereIn('id', all).select('id', 'started_at', 'status');
    const order = rows.sort((a, b) => (a.started_at < b.started_at ? -1 : 1)).map((row) => row.id);
    expect(rows.every((row) => row.status === 'succeeded')).toBe(true);
    // The first of the batch may already have started; the operator's run comes right after it at the latest.
    expect(order.indexOf(lone.id)).toBeLessThanOrEqual(1);
  }, 180_000);
});
