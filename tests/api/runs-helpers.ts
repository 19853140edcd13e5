/**
 * Shared pieces of the runs API tests: signed-in clients, captures made through the upload and
 * synthesizer endpoints, chains made through the chains API, and waiting for a run to reach a
 * status. The server itself is started by runs-server.ts (also used by the benchmark).
 */
import { expect } from 'vitest';
import { demoPassword } from '@/lib/server/seed';
import { Client } from '../helpers/client';
import { sleep } from './runs-server';

export { startRunsServer, sleep, type RunsServer } from './runs-server';

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
    body: new Uint8Array(samples.buffer as ArrayBuffer, samples.byteOffset, samples.byteLength),
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
