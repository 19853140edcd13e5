/**
 * Restart recovery: a run executing when the server process is killed (SIGKILL, no clean-up) is
 * queued again by the next server on the same data folder and completes; what the killed attempt
 * was writing is removed.
 */
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createChain, finished, signedIn, slowChain, startRunsServer, submitRun, synthCapture, waitForRun, type RunsServer } from './runs-helpers';

let first: RunsServer | undefined;
let second: RunsServer | undefined;

afterAll(async () => {
  // Both servers share one data folder: the last one to stop removes it.
  if (second) {
    await first?.stop(true);
    await first?.db.destroy();
    await second.stop();
  } else {
    await first?.stop();
  }
});

function storedOutputs(dataDir: string): string[] {
  const root = join(dataDir, 'objects', 'run-outputs');
  return existsSync(root) ? readdirSync(root).filter((name) => existsSync(join(root, name, 'data'))) : [];
}

describe('restart recovery', () => {
  it('completes a run that was executing when the server was killed', async () => {
    first = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '1' } });
    const engineer = await signedIn(first.baseUrl, 'engineer@saltmarsh.test');
    const capture = await synthCapture(engineer, 'Long beacon capture', 0.5);
    const chain = await createChain(engineer, slowChain());
    const run = await submitRun(engineer, chain, capture);
    await waitForRun(engineer, run.id, (r) => r.status === 'running' && r.progress >= 0.1, 60_000);
    const interruptedKey = (await first.db('runs').where({ id: run.id }).first()).pending_output_key;
    expect(interruptedKey).toMatch(/^run-outputs\//);
    await first.kill();
    expect((await first.db('runs').where({ id: run.id }).first()).status).toBe('running');

    second = await startRunsServer({ dataDir: first.dataDir, env: { QUADRILLE_RUN_CONCURRENCY: '1' } });
    const again = await signedIn(second.baseUrl, 'engineer@saltmarsh.test');
    const done = await waitForRun(again, run.id, finished, 120_000);
    expect(done.status).toBe('succeeded');
    expect(done.fromCache).toBe(false);
    expect(done.progress).toBe(1);
    expect(done.results.probes[0].stageId).toBe('psd');
    expect(done.results.input.samples).toBe(2_000_000);
    expect(second.output()).toMatch(/Requeued 1 run/);
    // Only the finished attempt's output remains; the killed attempt's object is gone.
    const result = await second.db('run_results').where({ id: (await second.db('runs').where({ id: run.id }).first()).result_id }).first();
    expect(result.output_key).not.toBe(interruptedKey);
    expect(storedOutputs(second.dataDir)).toEqual([result.output_key.split('/')[1]]);
  }, 240_000);
});
