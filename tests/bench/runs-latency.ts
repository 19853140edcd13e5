/**
 * `npm run bench` (second part): responsiveness of the built server while runs execute.
 *
 * 1. GET /api/me latency, 200 sequential requests, on an idle server (baseline) and while two long
 *    runs execute in worker threads (QUADRILLE_RUN_CONCURRENCY=2): p50, p95, max. Target: p95 < 50 ms.
 * 2. Time to answer a cached run: POST /api/runs for a chain and capture whose result is cached,
 *    20 times: p50 and max. Target: < 100 ms.
 *
 * Needs a build (`npm run build`); QUADRILLE_TEST_DIST picks another build folder. Options:
 * --requests N (default 200), --seconds S capture length in seconds at 4 Msps (default 1).
 */
import { availableParallelism, loadavg } from 'node:os';
import { Client } from '../helpers/client';
import { demoPassword } from '../../src/lib/server/seed';
import { sleep, startRunsServer } from '../api/runs-server';

const args = process.argv.slice(2);
function option(name: string, fallback: number): number {
  const at = args.indexOf(`--${name}`);
  return at >= 0 ? Number(args[at + 1]) : fallback;
}
const requests = option('requests', 200);
const captureSeconds = option('seconds', 1);

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

function summary(samples: number[]): { p50: number; p95: number; max: number } {
  const sorted = [...samples].sort((a, b) => a - b);
  return { p50: percentile(sorted, 50), p95: percentile(sorted, 95), max: sorted.at(-1)! };
}

async function timed<T>(action: () => Promise<T>): Promise<[number, T]> {
  const start = performance.now();
  const value = await action();
  return [performance.now() - start, value];
}

async function must(response: Promise<{ status: number; text: string; body: any }>, status: number): Promise<any> {
  const answer = await response;
  if (answer.status !== status) throw new Error(`expected ${status}, got ${answer.status}: ${answer.text}`);
  return answer.body;
}

async function meLatencies(client: Client, count: number): Promise<number[]> {
  const out: number[] = [];
  for (let k = 0; k < count; k++) {
    const [ms, answer] = await timed(() => client.get('/api/me'));
    if (answer.status !== 200) throw new Error(`GET /api/me answered ${answer.status}`);
    out.push(ms);
  }
  return out;
}

const fixed = (value: number) => value.toFixed(1).padStart(7);

const server = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '2' } });
try {
  const client = new Client(server.baseUrl);
  await must(client.signIn('engineer@saltmarsh.test', demoPassword), 200);
  const stage = (cutoff: number) => ({ id: 'lp', kind: 'filter', params: { design: 'window', response: 'lowpass', cutoff, taps: 511 } });
  const chains: string[] = [];
  for (const cutoff of [200_000, 300_000]) {
    const document = { version: 1, name: `Bench wide filter ${cutoff / 1000} kHz`, stages: [stage(cutoff), { id: 'psd', kind: 'spectrum', params: { fftSize: 1024 }, probe: true }] };
    chains.push((await must(client.post('/api/chains', { name: document.name, visibility: 'private', document }), 201)).id);
  }
  const spec = { sampleRate: 4_000_000, duration: captureSeconds, tones: [{ frequency: 500_000, level: -6, phase: 0 }], noise: { mode: 'total', level: -70 }, seed: 5 };
  const capture = (await must(client.post('/api/synth', { name: 'Bench beacon', visibility: 'private', spec }), 201)).id;

  await meLatencies(client, 20); // warm-up: first requests compile routes and fill caches
  const idle = summary(await meLatencies(client, requests));

  const runs: string[] = [];
  for (const chain of chains) runs.push((await must(client.post('/api/runs', { chain_id: chain, capture_id: capture }), 202)).runs[0].id);
  for (;;) {
    const states = await Promise.all(runs.map(async (id) => (await client.get(`/api/runs/${id}`)).body));
    if (states.every((run) => run.status === 'running' && run.progress > 0)) break;
    if (states.some((run) => run.status !== 'running' && run.status !== 'queued')) throw new Error(`a run ended early: ${JSON.stringify(states.map((r) => r.status))}`);
    await sleep(50);
  }
  const busy = summary(await meLatencies(client, requests));
  const during = await Promise.all(runs.map(async (id) => (await client.get(`/api/runs/${id}`)).body));
  const stillRunning = during.filter((run) => run.status === 'running').length;

  let finished: any;
  for (;;) {
    finished = (await client.get(`/api/runs/${runs[0]}`)).body;
    if (finished.status !== 'running' && finished.status !== 'queued') break;
    await sleep(200);
  }
  if (finished.status !== 'succeeded') throw new Error(`bench run ended ${finished.status}: ${JSON.stringify(finished.error)}`);
  const cachedTimes: number[] = [];
  for (let k = 0; k < 20; k++) {
    const [ms, answer] = await timed(() => must(client.post('/api/runs', { chain_id: chains[0], capture_id: capture }), 202));
    if (!answer.runs[0].fromCache || answer.runs[0].status !== 'succeeded') throw new Error('the repeated run was not answered from the cache');
    cachedTimes.push(ms);
  }
  const cached = summary(cachedTimes);

  console.log(`\nRuns server responsiveness (${availableParallelism()} cores, load average ${loadavg().map((l) => l.toFixed(2)).join(' ')})`);
  console.log(`capture: ${captureSeconds * 4e6} cf32 samples; two runs of a 511-tap full-rate FIR + spectrum, QUADRILLE_RUN_CONCURRENCY=2`);
  console.log(`run time of the first run: ${(finished.durationMs / 1000).toFixed(1)} s\n`);
  console.log('                                        p50 ms  p95 ms  max ms');
  console.log(`GET /api/me, idle (${requests} requests)        ${fixed(idle.p50)} ${fixed(idle.p95)} ${fixed(idle.max)}`);
  console.log(`GET /api/me, 2 runs executing (${requests})     ${fixed(busy.p50)} ${fixed(busy.p95)} ${fixed(busy.max)}   (${stillRunning} of 2 still running at the end; target p95 < 50 ms: ${busy.p95 < 50 ? 'met' : 'MISSED'})`);
  console.log(`POST /api/runs answered from cache (20)  ${fixed(cached.p50)} ${fixed(cached.p95)} ${fixed(cached.max)}   (target < 100 ms: ${cached.max < 100 ? 'met' : cached.p50 < 100 ? 'met at p50' : 'MISSED'})`);
  for (const id of runs) await client.post(`/api/runs/${id}/cancel`);
} finally {
  await server.stop();
}
