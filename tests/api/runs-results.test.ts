/**
 * What a finished run gives back: results in the command line's results.json shape (checked
 * against the CLI itself on the same chain and capture), exports that parse back (JSON, CSV,
 * SigMF pair), plot data reduced to the plot's width, comparisons, and the live event stream.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseSigmfMeta } from '@/dsp/formats';
import type { Client } from '../helpers/client';
import { quadrille, writeSigmf } from '../cli-helpers';
import {
  complexTone, createChain, finished, quickChain, signedIn, slowChain, startRunsServer, submitRun, uploadCapture, waitForRun, type RunsServer,
} from './runs-helpers';

let server: RunsServer;
let engineer: Client;
let operator: Client;
const tone = complexTone(131_072, 4e6, 520_000, { seed: 3 });
let captureId: string;
let chainId: string;
let run: any;
const work = mkdtempSync(join(tmpdir(), 'quadrille-runs-cli-'));

beforeAll(async () => {
  server = await startRunsServer({ env: { QUADRILLE_RUN_CONCURRENCY: '1', QUADRILLE_SSE_HEARTBEAT_MS: '250' } });
  engineer = await signedIn(server.baseUrl, 'engineer@saltmarsh.test');
  operator = await signedIn(server.baseUrl, 'operator@saltmarsh.test');
  captureId = await uploadCapture(engineer, 'Beacon at 520 kHz', tone, 4e6);
  chainId = await createChain(engineer, quickChain(200_000, true));
  const submitted = await submitRun(engineer, chainId, captureId);
  run = await waitForRun(engineer, submitted.id, finished);
  expect(run.status).toBe('succeeded');
});
afterAll(async () => {
  await server?.stop();
  rmSync(work, { recursive: true, force: true });
});

/** The structure of a JSON value: objects by key, arrays by length and first element, leaves by type. */
function shape(value: unknown): unknown {
  if (Array.isArray(value)) return { length: value.length, first: value.length ? shape(value[0]) : null };
  if (value && typeof value === 'object') return Object.fromEntries(Object.keys(value).sort().map((key) => [key, shape((value as Record<string, unknown>)[key])]));
  return value === null ? 'null' : typeof value;
}

async function download(client: Client, path: string): Promise<{ status: number; headers: Headers; bytes: Buffer }> {
  const response = await fetch(client.baseUrl + path, { headers: { cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } });
  return { status: response.status, headers: response.headers, bytes: Buffer.from(await response.arrayBuffer()) };
}

describe('results', () => {
  it('have the same shape and probe values as the command line on the same chain and capture', async () => {
    writeSigmf(join(work, 'beacon'), tone, 4e6);
    writeFileSync(join(work, 'chain.json'), JSON.stringify(quickChain(200_000, true)));
    const cli = await quadrille('run', '--chain', join(work, 'chain.json'), '--input', join(work, 'beacon.sigmf-meta'), '--out', join(work, 'out'), '--quiet');
    expect(cli.code, cli.stderr).toBe(0);
    const expected = JSON.parse(readFileSync(join(work, 'out', 'results.json'), 'utf8'));
    expect(shape(run.results)).toEqual(shape(expected));
    expect(run.results.probes).toEqual(expected.probes);
    expect(run.results.output).toEqual(expected.output);
    expect(run.results.input).toMatchObject({ ...expected.input, path: `/api/captures/${captureId}` });
    expect(run.results.chain.stages).toEqual(expected.chain.stages);
    // The output capture is byte for byte the command line's.
    const data = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-data`);
    expect(data.bytes.equals(readFileSync(join(work, 'out', 'output.sigmf-data')))).toBe(true);
  }, 180_000);

  it('export as JSON, CSV and a SigMF pair that parse back', async () => {
    const json = await download(engineer, `/api/runs/${run.id}/export?format=json`);
    expect(json.status).toBe(200);
    expect(json.headers.get('content-disposition')).toMatch(/attachment; filename="run-[0-9a-f]{8}-results\.json"/);
    expect(JSON.parse(json.bytes.toString('utf8'))).toEqual(run.results);

    const psd = run.results.probes.find((probe: any) => probe.stageId === 'psd').spectrum;
    const spectrum = await download(engineer, `/api/runs/${run.id}/export?format=csv-spectrum&probe=psd`);
    expect(spectrum.headers.get('content-type')).toMatch(/^text\/csv/);
    const lines = spectrum.bytes.toString('utf8').trimEnd().split('\r\n');
    expect(lines[0]).toBe(`frequency_hz,level_${psd.unit.replace('/', '_per_')}`);
    expect(lines).toHaveLength(psd.frequencies.length + 1);
    const rows = lines.slice(1).map((line) => line.split(',').map(Number));
    expect(rows.map((row) => row[0])).toEqual(psd.frequencies);
    expect(rows.map((row) => row[1])).toEqual(psd.levels);
    expect((await engineer.get(`/api/runs/${run.id}/export?format=csv-spectrum&probe=meas`)).body.error).toMatchObject({ code: 'no_spectrum', field: 'probe' });

    const readouts = (await download(engineer, `/api/runs/${run.id}/export?format=csv-readouts`)).bytes.toString('utf8').trimEnd().split('\r\n');
    expect(readouts[0]).toBe('probe,name,value,unit');
    const expected = run.results.probes.flatMap((probe: any) => (probe.readouts ?? []).map((r: any) => [probe.stageId, r.name, r.value, r.unit]));
    expect(expected.length).toBeGreaterThan(3);
    const parsed = readouts.slice(1).map((line) => {
      const [probe, name, value, unit] = line.split(',');
      return [probe, name, value === '' ? null : Number(value), unit];
    });
    expect(parsed).toEqual(expected);

    const meta = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-meta`);
    const parsedMeta = parseSigmfMeta(meta.bytes.toString('utf8'));
    expect(parsedMeta.global).toMatchObject({ datatype: 'cf32_le', sampleRate: 500_000, version: '1.2.0' });
    const data = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-data`);
    expect(data.headers.get('content-length')).toBe(String(run.results.output.samples * 8));
    // core:sha512 is the hash of the data file (SigMF v1.2 global core:sha512).
    expect(parsedMeta.global.sha512).toBe(createHash('sha512').update(data.bytes).digest('hex'));

    const bad = await engineer.get(`/api/runs/${run.id}/export?format=xlsx`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('format');
  });

  it('plot data never has more points than the width', async () => {
    const full = run.results.probes.find((probe: any) => probe.stageId === 'psd').spectrum;
    const spectrum = await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=spectrum&width=100`);
    expect(spectrum.status).toBe(200);
    expect(spectrum.body.frequencies.length).toBeLessThanOrEqual(100);
    expect(spectrum.body.levels).toHaveLength(spectrum.body.frequencies.length);
    // Max per column keeps the peak bin at its own frequency.
    const top = Math.max(...full.levels);
    expect(Math.max(...spectrum.body.levels)).toBe(top);
    expect(spectrum.body.frequencies[spectrum.body.levels.indexOf(top)]).toBe(full.frequencies[full.levels.indexOf(top)]);

    const trace = await engineer.get(`/api/runs/${run.id}/plot?probe=dec&kind=trace&width=50`);
    expect(trace.status, trace.text).toBe(200);
    expect(trace.body.channels).toHaveLength(2);
    for (const channel of trace.body.channels) {
      expect(channel.min.length).toBeLessThanOrEqual(50);
      expect(Math.min(...channel.min)).toBeGreaterThanOrEqual(-1);
    }
    const fullTrace = run.results.probes.find((probe: any) => probe.stageId === 'dec').trace;
    expect(Math.max(...trace.body.channels[0].max)).toBe(Math.max(...fullTrace.channels[0].max));
    const constellation = await engineer.get(`/api/runs/${run.id}/plot?probe=dec&kind=constellation&width=64`);
    expect(constellation.body.points.length / 2).toBeLessThanOrEqual(64);
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=nope&kind=spectrum&width=100`)).status).toBe(404);
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=spectrum&width=1`)).status).toBe(400);
  });

  it('compare puts spectra side by side and readouts with their differences', async () => {
    const quieter = complexTone(131_072, 4e6, 520_000, { amplitude: 0.25, seed: 5 });
    const otherCapture = await uploadCapture(engineer, 'Beacon, rev B board', quieter, 4e6);
    const other = await waitForRun(engineer, (await submitRun(engineer, chainId, otherCapture)).id, finished);
    const response = await engineer.get(`/api/runs/compare?ids=${run.id},${other.id}&width=200`);
    expect(response.status, response.text).toBe(200);
    expect(response.body.runs.map((r: any) => r.id)).toEqual([run.id, other.id]);
    expect(response.body.spectra.filter((s: any) => s.probe === 'psd').map((s: any) => s.runId)).toEqual([run.id, other.id]);
    for (const spectrum of response.body.spectra) expect(spectrum.frequencies.length).toBeLessThanOrEqual(200);
    const power = response.body.readouts.find((r: any) => r.probe === 'meas' && /tone/i.test(r.name) && r.unit === 'dBFS');
    expect(power).toBeDefined();
    // Half the amplitude is 20 log10(0.5) = -6.02 dB (definition of the decibel).
    expect(power.differences[other.id]).toBeCloseTo(-6.02, 1);
    expect(power.differences[run.id]).toBe(0);
    expect((await engineer.get(`/api/runs/compare?ids=${run.id}`)).status).toBe(400);
    expect((await engineer.get(`/api/runs/compare?ids=${run.id},00000000-0000-4000-8000-000000000000`)).status).toBe(404);
  }, 180_000);
});

describe('event stream', () => {
  it('sends throttled status events, heartbeats and done, then closes', async () => {
    const medium = await uploadCapture(engineer, 'Medium beacon', complexTone(400_000, 4e6, 500_000, { seed: 9 }), 4e6);
    const slow = await createChain(engineer, slowChain());
    const submitted = await submitRun(engineer, slow, medium);
    const started = Date.now();
    const response = await fetch(`${server.baseUrl}/api/runs/${submitted.id}/events`, {
      headers: { cookie: [...engineer.cookies].map(([k, v]) => `${k}=${v}`).join('; '), accept: 'text/event-stream' },
      signal: AbortSignal.timeout(120_000),
    });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toMatch(/^text\/event-stream/);
    const text = await response.text(); // resolves only when the server closes the stream
    const seconds = (Date.now() - started) / 1000;
    const events = text.split('\n\n').filter((block) => block.startsWith('event:')).map((block) => {
      const [eventLine, dataLine] = block.split('\n');
      return { event: eventLine!.slice('event: '.length), data: JSON.parse(dataLine!.slice('data: '.length)) };
    });
    const statuses = events.filter((e) => e.event === 'status');
    expect(statuses.length).toBeGreaterThan(1);
    expect(statuses.some((e) => e.data.status === 'running' && e.data.progress > 0 && e.data.progress < 1)).toBe(true);
    expect(Object.keys(statuses[0]!.data).sort()).toEqual(['currentStage', 'etaSeconds', 'progress', 'status']);
    // At most about 5 status events per second (200 ms apart), plus the first and the last.
    expect(statuses.length).toBeLessThanOrEqual(Math.ceil(seconds * 5) + 3);
    expect(events.at(-1)).toEqual({ event: 'done', data: { status: 'succeeded', fromCache: false } });
    expect(text).toMatch(/^: heartbeat /m);
    // A finished run's stream says done at once and closes.
    const again = await fetch(`${server.baseUrl}/api/runs/${submitted.id}/events`, { headers: { cookie: [...engineer.cookies].map(([k, v]) => `${k}=${v}`).join('; ') } });
    expect(await again.text()).toMatch(/event: done\ndata: \{"status":"succeeded"/);
  }, 180_000);

  it('is refused to the signed-out and hidden from other users for a private run', async () => {
    const privateCapture = await uploadCapture(engineer, 'Private beacon', complexTone(8192, 4e6, 500_000, { seed: 21 }), 4e6, 'private');
    const privateRun = await submitRun(engineer, chainId, privateCapture);
    expect((await fetch(`${server.baseUrl}/api/runs/${privateRun.id}/events`)).status).toBe(401);
    expect((await operator.get(`/api/runs/${privateRun.id}/events`)).status).toBe(404);
    await waitForRun(engineer, privateRun.id, finished);
  }, 180_000);
});
