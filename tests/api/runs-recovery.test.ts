/**
 * Restart recovery: a run executing when the server process is killed (SIGKILL, no clean-up) is
 * queued again by the next server on the same data folder and completes; what the killed attempt
 * was writing is removed. A server stopped with SIGTERM puts its executing run back in the queue
 * itself, leaves no output object behind, and the next server starts it without being asked.
 */
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { createChain, finished, signedIn, sleep, slowChain, startRunsServer, submitRun, synthCapture, waitForRun, type RunsServer } from './runs-helpers';

/** Servers started by a test, in order; they share one data folder, which the last one removes. */
let servers: RunsServer[] = [];

afterEach(async () => {
  const started = servers;
  servers = [];
  for (const [index, server] of started.entries()) {
    const last = index === started.length - 1;
    await server.stop(!last);
    if (!last) await server.db.destroy();
  }
});

async function start(dataDir?: string, untouched = false, env: Record<string, string> = {}): Promise<RunsServer> {
  const server = await startRunsServer({ dataDir, untouched, env: { QUADRILLE_RUN_CONCURRENCY: '1', ...env } });
  servers.push(server);
  return server;
}

/** Polls the runs table (not the API) until the run's row satisfies `done`. */
async function waitForRow(db: RunsServer['db'], id: string, done: (row: any) => boolean, timeoutMs: number): Promise<any> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const row = await db('runs').where({ id }).first();
    if (done(row)) return row;
    if (Date.now() > deadline) throw new Error(`run ${id} still ${row.status} after ${timeoutMs} ms`);
    await sleep(100);
  }
}

function storedOutputs(dataDir: string): string[] {
  const root = join(dataDir, 'objects', 'run-outputs');
  return existsSync(root) ? readdirSync(root).filter((name) => existsSync(join(root, name, 'data'))) : [];
}

describe('restart recovery', () => {
  it('completes a run that was executing when the server was killed', async () => {
    const first = await start();
    const engineer = await signedIn(first.baseUrl, 'engineer@saltmarsh.test');
    const capture = await synthCapture(engineer, 'Long beacon capture', 0.5);
    const chain = await createChain(engineer, slowChain());
    const run = await submitRun(engineer, chain, capture);
    await waitForRun(engineer, run.id, (r) => r.status === 'running' && r.progress >= 0.1, 60_000);
    const interruptedKey = (await first.db('runs').where({ id: run.id }).first()).pending_output_key;
    expect(interruptedKey).toMatch(/^run-outputs\//);
    await first.kill();
    expect((await first.db('runs').where({ id: run.id }).first()).status).toBe('running');

    const second = await start(first.dataDir);
    const again = await signedIn(second.baseUrl, 'engineer@saltmarsh.test');
    const done = await waitForRun(again, run.id, finished, 120_000);
    expect(done.status).toBe('succeeded');
    expect(done.fromCache).toBe(false);
    expect(done.progress).toBe(1);
    expect(done.summary.testPoints[0].stageId).toBe('psd');
    // 0.5 s at 4 Msps (synthCapture).
    expect(done.summary.input.samples).toBe(2_000_000);
    expect(second.output()).toMatch(/Requeued 1 run/);
    // Only the finished attempt's output remains; the killed attempt's object is gone.
    const result = await second.db('run_results').where({ id: (await second.db('runs').where({ id: run.id }).first()).result_id }).first();
    expect(result.output_key).not.toBe(interruptedKey);
    expect(storedOutputs(second.dataDir)).toEqual([result.output_key.split('/')[1]]);
  }, 240_000);

  it('puts an executing run back in the queue on SIGTERM, and the next start finishes it unasked', async () => {
    const first = await start();
    const engineer = await signedIn(first.baseUrl, 'engineer@saltmarsh.test');
    const capture = await synthCapture(engineer, 'Long beacon capture', 0.5);
    const chain = await createChain(engineer, slowChain());
    const run = await submitRun(engineer, chain, capture);
    await waitForRun(engineer, run.id, (r) => r.status === 'running' && r.progress >= 0.1, 60_000);
    await first.stop(true);
    expect(first.process.exitCode).toBe(0);
    const row = await first.db('runs').where({ id: run.id }).first();
    expect(row).toMatchObject({ status: 'queued', progress: 0, pending_output_key: null, result_id: null });
    expect(storedOutputs(first.dataDir)).toEqual([]);
    expect(first.output()).toMatch(/back in the queue/);

    // The second server gets no request at all: its scheduler starts with it.
    const second = await start(first.dataDir, true);
    const done = await waitForRow(second.db, run.id, (r) => r.status === 'succeeded' || r.status === 'failed', 120_000);
    expect(done.status).toBe('succeeded');
    const result = await second.db('run_results').where({ id: (await second.db('runs').where({ id: run.id }).first()).result_id }).first();
    expect(storedOutputs(second.dataDir)).toEqual([result.output_key.split('/')[1]]);
  }, 240_000);

  it('lets an executing run finish within the grace period on SIGTERM before the process ends', async () => {
    const server = await start(undefined, false, { QUADRILLE_RUN_SHUTDOWN_GRACE_MS: '600000' });
    const engineer = await signedIn(server.baseUrl, 'engineer@saltmarsh.test');
    const capture = await synthCapture(engineer, 'Short beacon capture', 0.1, 2);
    const run = await submitRun(engineer, await createChain(engineer, slowChain()), capture);
    await waitForRun(engineer, run.id, (r) => r.status === 'running', 60_000);
    await server.stop(true);
    expect(server.process.exitCode).toBe(0);
    const row = await server.db('runs').where({ id: run.id }).first();
    expect(row.status).toBe('succeeded');
    const result = await server.db('run_results').where({ id: row.result_id }).first();
    expect(storedOutputs(server.dataDir)).toEqual([result.output_key.split('/')[1]]);
  }, 240_000);
});
