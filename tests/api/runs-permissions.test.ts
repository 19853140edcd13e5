/**
 * Who may do what with runs, as a table of role x action x ownership, and the run quotas: a
 * private chain or capture of someone else answers 404, an admin sees and cancels the whole queue,
 * compute seconds per day and waiting runs answer 429 with a clear message, and a user's
 * concurrent-run quota holds while another user's run takes the free slot.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client } from '../helpers/client';
import {
  complexTone, createChain, finished, quickChain, signedIn, slowChain, startRunsServer, submitRun, synthCapture, uploadCapture,
  waitForRun, type RunsServer,
} from './runs-helpers';

let server: RunsServer;
let admin: Client;
let engineer: Client;
let operator: Client;
let teamChain: string;
let privateChain: string;
let teamCapture: string;
let privateCapture: string;
let operatorCapture: string;

beforeAll(async () => {
  server = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '2', QUADRILLE_QUOTA_CONCURRENT_RUNS: '1', QUADRILLE_RUN_MAX_PENDING: '4' } });
  admin = await signedIn(server.baseUrl, 'admin@saltmarsh.test');
  engineer = await signedIn(server.baseUrl, 'engineer@saltmarsh.test');
  operator = await signedIn(server.baseUrl, 'operator@saltmarsh.test');
  teamChain = await createChain(engineer, quickChain(210_000), 'team');
  privateChain = await createChain(engineer, quickChain(220_000), 'private');
  teamCapture = await uploadCapture(engineer, 'Team beacon', complexTone(16_384, 4e6, 500_000, { seed: 31 }), 4e6, 'team');
  privateCapture = await uploadCapture(engineer, 'Private beacon', complexTone(16_384, 4e6, 500_000, { seed: 32 }), 4e6, 'private');
  operatorCapture = await uploadCapture(operator, 'Operator beacon', complexTone(16_384, 4e6, 500_000, { seed: 33 }), 4e6, 'team');
});
afterAll(async () => {
  await server?.stop();
});

describe('asking for runs', () => {
  it('refuses the signed-out, and hides private chains and captures of others as 404 naming the field', async () => {
    const anonymous = new Client(server.baseUrl);
    expect((await anonymous.post('/api/runs', { chain_id: teamChain, capture_id: teamCapture })).status).toBe(401);
    expect((await anonymous.get('/api/runs')).status).toBe(401);
    const hiddenChain = await operator.post('/api/runs', { chain_id: privateChain, capture_id: operatorCapture });
    expect(hiddenChain.status).toBe(404);
    expect(hiddenChain.body.error).toMatchObject({ code: 'not_found', field: 'chain_id' });
    const hiddenCapture = await operator.post('/api/runs', { chain_id: teamChain, capture_ids: [operatorCapture, privateCapture] });
    expect(hiddenCapture.status).toBe(404);
    expect(hiddenCapture.body.error).toMatchObject({ code: 'not_found', field: 'capture_ids.1' });
    // Nothing was queued by the refused batch.
    expect(await server.db('runs').where({ capture_id: operatorCapture }).first()).toBeUndefined();
  });

  it('checks the body: one of capture_id or capture_ids, a known revision, a chain that fits the capture', async () => {
    const both = await engineer.post('/api/runs', { chain_id: teamChain, capture_id: teamCapture, capture_ids: [teamCapture] });
    expect(both.body.error).toMatchObject({ code: 'required', field: 'capture_id' });
    expect((await engineer.post('/api/runs', { chain_id: teamChain })).status).toBe(400);
    const unknown = await engineer.post('/api/runs', { chain_id: teamChain, capture_id: teamCapture, speed: 'fast' });
    expect(unknown.body.error).toMatchObject({ code: 'unknown_field', field: 'speed' });
    const revision = await engineer.post('/api/runs', { chain_id: teamChain, revision: 9, capture_id: teamCapture });
    expect(revision.status).toBe(404);
    expect(revision.body.error.field).toBe('revision');
    // A 1 kHz capture cannot hold a 200 kHz cut-off: refused before anything runs.
    const slowRate = await uploadCapture(engineer, 'Audio-rate capture', complexTone(4096, 1_000, 100), 1_000);
    const unfit = await engineer.post('/api/runs', { chain_id: teamChain, capture_id: slowRate });
    expect(unfit.status).toBe(422);
    expect(unfit.body.error).toMatchObject({ code: 'chain_cannot_run', field: 'capture_id' });
  });
});

describe('reading, cancelling and the admin queue', () => {
  it('follows the table: team runs are visible, private runs only to their requester, cancel only by requester or admin', async () => {
    const team = await submitRun(engineer, teamChain, teamCapture);
    const hidden = await submitRun(engineer, teamChain, privateCapture);
    await waitForRun(engineer, team.id, finished);
    await waitForRun(engineer, hidden.id, finished);

    expect((await operator.get(`/api/runs/${team.id}`)).status).toBe(200);
    expect((await operator.get(`/api/runs/${team.id}`)).body.permissions).toEqual({ cancel: false, retry: false });
    expect((await operator.get(`/api/runs/${hidden.id}`)).status).toBe(404);
    // Private means owner only, for admins too.
    expect((await admin.get(`/api/runs/${hidden.id}`)).status).toBe(404);
    expect((await operator.get(`/api/runs/${hidden.id}/export?format=json`)).status).toBe(404);
    expect((await operator.get(`/api/runs/${team.id}/export?format=json`)).status).toBe(200);
    expect((await operator.get('/api/runs/not-a-run')).status).toBe(404);

    const listed = (await operator.get('/api/runs')).body.runs.map((run: { id: string }) => run.id);
    expect(listed).toContain(team.id);
    expect(listed).not.toContain(hidden.id);
    expect((await operator.get('/api/runs?all=1')).status).toBe(403);
    const queue = await admin.get('/api/runs?all=1');
    const seen = queue.body.runs.find((run: { id: string }) => run.id === hidden.id);
    expect(seen).toMatchObject({ chain: { name: quickChain().name }, capture: { name: 'Private capture' } });
    expect((await operator.get('/api/runs?status=bogus')).body.error.field).toBe('status');
    expect((await engineer.get(`/api/runs?status=succeeded&capture_id=${teamCapture}`)).body.runs.map((run: { id: string }) => run.id)).toEqual([team.id]);
  }, 180_000);

  it('lets an admin cancel any queued or running run, and no one else', async () => {
    const slow = await createChain(engineer, slowChain(), 'private');
    const long = await synthCapture(engineer, 'Long private beacon', 0.3, 41);
    await server.db('captures').where({ id: long }).update({ visibility: 'private' });
    const run = await submitRun(engineer, slow, long);
    expect((await operator.post(`/api/runs/${run.id}/cancel`)).status).toBe(404);
    await waitForRun(engineer, run.id, (r) => r.status === 'running');
    const cancelled = await admin.post(`/api/runs/${run.id}/cancel`);
    expect(cancelled.status).toBe(202);
    expect(cancelled.body.capture.name).toBe('Private capture');
    expect((await waitForRun(engineer, run.id, finished, 60_000)).status).toBe('cancelled');

    const teamRun = await submitRun(engineer, teamChain, (await uploadCapture(engineer, 'Another team beacon', complexTone(8192, 4e6, 500_000, { seed: 42 }), 4e6)));
    const refused = await operator.post(`/api/runs/${teamRun.id}/cancel`);
    expect([403, 409]).toContain(refused.status); // 409 if it already finished: either way it was not the operator's to stop
    await waitForRun(engineer, teamRun.id, finished);
  }, 180_000);
});

describe('quotas', () => {
  it("holds a user's concurrent-run quota while another user's run takes the free slot", async () => {
    const slow = await createChain(engineer, slowChain(), 'team');
    const captures = [await synthCapture(engineer, 'Quota A', 0.1, 51), await synthCapture(engineer, 'Quota B', 0.1, 52)];
    const batch = (await engineer.post('/api/runs', { chain_id: slow, capture_ids: captures })).body.runs;
    const first = await waitForRun(engineer, batch[0].id, (r) => r.status === 'running');
    expect(first.status).toBe('running');
    const operatorRun = await submitRun(operator, slow, await synthCapture(operator, 'Quota C', 0.1, 53));
    await waitForRun(operator, operatorRun.id, (r) => r.status !== 'queued');
    // Two slots, but the engineer may have one running: the second of the batch waits.
    const engineerRunning = await server.db('runs').where({ requested_by: first.requestedBy.id, status: 'running' }).count({ count: '*' }).first();
    expect(Number(engineerRunning!.count)).toBeLessThanOrEqual(1);
    for (const run of [...batch, operatorRun]) await waitForRun(engineer, run.id, finished, 90_000);
    const rows = await server.db('runs').whereIn('id', batch.map((r: { id: string }) => r.id)).orderBy('started_at');
    // The engineer's second run started only after the first finished.
    expect(new Date(rows[1].started_at).getTime()).toBeGreaterThanOrEqual(new Date(rows[0].finished_at).getTime());
  }, 180_000);

  it('answers 429 too_many_runs past the waiting-run limit and 429 quota_exceeded with no compute seconds left', async () => {
    const captures: string[] = [];
    for (let k = 0; k < 5; k++) captures.push(await uploadCapture(operator, `Batch ${k}`, complexTone(4096, 4e6, 500_000, { seed: 60 + k }), 4e6));
    const crowded = await operator.post('/api/runs', { chain_id: teamChain, capture_ids: captures });
    expect(crowded.status).toBe(429);
    expect(crowded.body.error.code).toBe('too_many_runs');
    expect(crowded.body.error.message).toMatch(/at most 4/);

    // A result of this test's own to be answered from the cache below (already cached if an earlier test ran it).
    await waitForRun(engineer, (await submitRun(engineer, teamChain, teamCapture)).id, finished, 60_000);
    const userId = (await operator.get('/api/me')).body.id;
    await server.db('user_quotas').insert({ user_id: userId, compute_seconds_per_day: 5, updated_at: new Date().toISOString() }).onConflict('user_id').merge();
    await server.db('compute_usage').insert({ user_id: userId, day: new Date().toISOString().slice(0, 10), seconds: 6 }).onConflict(['user_id', 'day']).merge();
    const spent = await operator.post('/api/runs', { chain_id: teamChain, capture_id: captures[0] });
    expect(spent.status).toBe(429);
    expect(spent.body.error.code).toBe('quota_exceeded');
    expect(spent.body.error.message).toMatch(/used 6 of your 5 compute seconds/);
    expect(Number(spent.headers.get('retry-after'))).toBeGreaterThan(0);
    // A cached result costs nothing, so it is still answered.
    const cached = await operator.post('/api/runs', { chain_id: teamChain, capture_id: teamCapture });
    expect(cached.status).toBe(202);
    expect(cached.body.runs[0].fromCache).toBe(true);
  }, 180_000);
});
