/**
 * Shared pieces of the runs API tests: a server started on a data folder that outlives it (for the
 * restart test), signed-in clients, captures made through the upload and synthesizer endpoints,
 * chains made through the chains API, and waiting for a run to reach a status.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect } from 'vitest';
import type { Knex } from 'knex';
import { openDb } from '@/lib/server/db';
import { migrateToLatest } from '@/lib/server/db/migration-source';
import { demoPassword, seedDemo } from '@/lib/server/seed';
import { Client } from '../helpers/client';
import { freePort } from '../helpers/server';

/** The build under test: dist/ (npm test builds it), or QUADRILLE_TEST_DIST for a private build. */
const distDir = resolve(process.env.QUADRILLE_TEST_DIST ?? 'dist');
const entry = join(distDir, 'server/entry.mjs');

/** A built server on a data folder the test owns; it may be killed and started again on the same folder. */
export interface RunsServer {
  baseUrl: string;
  dataDir: string;
  db: Knex;
  process: ChildProcess;
  /** Everything the server printed. */
  output(): string;
  /** Kills the process (SIGKILL: no chance to clean up) and waits for it to exit. */
  kill(): Promise<void>;
  /** Stops the process; with `keepData` the folder and database handle stay for a restart. */
  stop(keepData?: boolean): Promise<void>;
}

/** Starts the built server on `dataDir` (a fresh folder, migrated and seeded, when absent). */
export async function startRunsServer(options: { dataDir?: string; env?: Record<string, string> } = {}): Promise<RunsServer> {
  if (!existsSync(entry)) throw new Error('dist/server/entry.mjs is missing: run `npm run build` first (npm test does).');
  if (!existsSync(join(distDir, 'workers/run-worker.mjs'))) throw new Error('dist/workers/run-worker.mjs is missing: run `npm run build` first.');
  const dataDir = options.dataDir ?? mkdtempSync(join(tmpdir(), 'quadrille-runs-'));
  const db = openDb(dataDir);
  if (!options.dataDir) {
    await migrateToLatest(db);
    await seedDemo(db);
  }
  const port = await freePort();
  const child = spawn(process.execPath, [entry], {
    env: { ...process.env, QUADRILLE_RUN_CONCURRENCY: '1', ...options.env, QUADRILLE_DATA_DIR: dataDir, HOST: '127.0.0.1', PORT: String(port), NODE_ENV: 'test' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk) => (output += chunk));
  child.stderr?.on('data', (chunk) => (output += chunk));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}\n${output}`);
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      // Not listening yet.
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`server did not answer within 30 s\n${output}`);
    }
    await sleep(100);
  }
  const exited = () => new Promise<void>((done) => (child.exitCode !== null || child.signalCode !== null ? done() : child.once('exit', () => done())));
  return {
    baseUrl,
    dataDir,
    db,
    process: child,
    output: () => output,
    async kill() {
      child.kill('SIGKILL');
      await exited();
    },
    async stop(keepData = false) {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill('SIGTERM');
        await exited();
      }
      if (!keepData) {
        await db.destroy();
        rmSync(dataDir, { recursive: true, force: true });
      }
    },
  };
}

export function sleep(ms: number): Promise<void> {
  return new Promise((wake) => setTimeout(wake, ms));
}

/** A client signed in as `email` (a demo account unless a password is given). */
export async function signedIn(baseUrl: string, email: string, password = demoPassword): Promise<Client> {
  const client = new Client(baseUrl);
  const response = await client.signIn(email, password);
  expect(response.status, response.text).toBe(200);
  return client;
}

type Stage = { id: string; kind: string; params: Record<string, unknown>; probe?: boolean };

/** A quick chain for 4 Msps complex input: mix to 0 Hz, low-pass, decimate by 8, spectrum and readouts. */
export function quickChain(cutoff = 200_000, probeDecimated = false): { version: 1; name: string; stages: Stage[] } {
  return {
    version: 1,
    name: 'Beacon down-conversion',
    stages: [
      { id: 'nco', kind: 'mix', params: { frequency: -500_000 } },
      { id: 'lp', kind: 'filter', params: { design: 'window', response: 'lowpass', cutoff, taps: 127 } },
      { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false }, ...(probeDecimated ? { probe: true } : {}) },
      { id: 'psd', kind: 'spectrum', params: { fftSize: 1024 }, probe: true },
      { id: 'meas', kind: 'measure', params: {} },
    ],
  };
}

/** A slow chain: a 511-tap FIR at the full rate (no decimation to share the work) and a spectrum. */
export function slowChain(): { version: 1; name: string; stages: Stage[] } {
  return {
    version: 1,
    name: 'Full-rate wide filter',
    stages: [
      { id: 'lp', kind: 'filter', params: { design: 'window', response: 'lowpass', cutoff: 200_000, taps: 511 } },
      { id: 'psd', kind: 'spectrum', params: { fftSize: 1024 }, probe: true },
    ],
  };
}

/** A chain that fails while running on a stream whose I equals Q: the blind I/Q estimate refuses it. */
export function blindIqChain(estimateSamples = 4096): { version: 1; name: string; stages: Stage[] } {
  return {
    version: 1,
    name: 'Blind I/Q correction',
    stages: [
      { id: 'gain', kind: 'gain', params: {} },
      { id: 'iq', kind: 'iq-correct', params: { mode: 'blind', estimateSamples } },
      { id: 'psd', kind: 'spectrum', params: { fftSize: 256 }, probe: true },
    ],
  };
}

/** Creates a chain through the API; answers its id. */
export async function createChain(client: Client, document: object, visibility: 'private' | 'team' = 'team'): Promise<string> {
  const response = await client.post('/api/chains', { name: (document as { name: string }).name, visibility, document });
  expect(response.status, response.text).toBe(201);
  return response.body.id;
}

/** Interleaved complex tone at `frequency` (Hz) plus a little deterministic dither; I equals Q when `sameIq`. */
export function complexTone(samples: number, sampleRate: number, frequency: number, options: { amplitude?: number; sameIq?: boolean; seed?: number } = {}): Float32Array {
  const { amplitude = 0.5, sameIq = false } = options;
  let state = (options.seed ?? 7) >>> 0;
  const random = () => {
    // xorshift32: only needs to be different from sample to sample, and repeatable.
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 4294967296 - 0.5;
  };
  const out = new Float32Array(2 * samples);
  for (let n = 0; n < samples; n++) {
    const phase = 2 * Math.PI * ((n * frequency) / sampleRate % 1);
    const i = amplitude * Math.cos(phase) + 1e-3 * random();
    out[2 * n] = i;
    out[2 * n + 1] = sameIq ? i : amplitude * Math.sin(phase) + 1e-3 * random();
  }
  return out;
}

/** Uploads cf32_le samples as a capture; answers the capture's id. */
export async function uploadCapture(client: Client, name: string, samples: Float32Array, sampleRate: number, visibility: 'private' | 'team' = 'team'): Promise<string> {
  const query = new URLSearchParams({ name, datatype: 'cf32_le', sample_rate: String(sampleRate), visibility });
  const response = await fetch(`${client.baseUrl}/api/captures?${query}`, {
    method: 'POST',
    headers: {
      cookie: [...client.cookies].map(([key, value]) => `${key}=${value}`).join('; '),
      origin: client.baseUrl,
      'content-type': 'application/octet-stream',
    },
    body: new Uint8Array(samples.buffer, samples.byteOffset, samples.byteLength),
  });
  const text = await response.text();
  expect(response.status, text).toBe(201);
  return JSON.parse(text).id;
}

/** Synthesizes a capture (one tone plus noise) of `samples` complex samples at 4 Msps; answers its id. */
export async function synthCapture(client: Client, name: string, seconds: number, seed = 1): Promise<string> {
  const response = await client.post('/api/synth', {
    name,
    visibility: 'team',
    spec: { sampleRate: 4_000_000, duration: seconds, tones: [{ frequency: 500_000, level: -6, phase: 0 }], noise: { mode: 'total', level: -70 }, seed },
  });
  expect(response.status, response.text).toBe(201);
  return response.body.id;
}

/** Asks for one run; answers the first entry of the 202 answer. */
export async function submitRun(client: Client, chainId: string, captureId: string, revision?: number): Promise<{ id: string; status: string; fromCache: boolean }> {
  const response = await client.post('/api/runs', { chain_id: chainId, capture_id: captureId, ...(revision ? { revision } : {}) });
  expect(response.status, response.text).toBe(202);
  return response.body.runs[0];
}

/** Polls GET /api/runs/:id until `done(run)` holds; answers that run. */
export async function waitForRun(client: Client, id: string, done: (run: any) => boolean, timeoutMs = 60_000): Promise<any> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const response = await client.get(`/api/runs/${id}`);
    expect(response.status, response.text).toBe(200);
    if (done(response.body)) return response.body;
    if (Date.now() > deadline) throw new Error(`run ${id} still ${response.body.status} (progress ${response.body.progress}) after ${timeoutMs} ms`);
    await sleep(100);
  }
}

/** True once a run has ended. */
export function finished(run: { status: string }): boolean {
  return run.status === 'succeeded' || run.status === 'failed' || run.status === 'cancelled';
}
