/**
 * What a finished run gives back: a summary whose figures match the synthesised tone, exports that
 * parse back (results.json in the command line's shape, CSV, SigMF pair), plot data reduced to the
 * plot's width, comparisons, and the live event stream.
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
  it('summarise the run with figures known from the synthesised tone', async () => {
    const summary = run.summary;
    expect(run.results).toBeUndefined();
    // 131 072 complex samples at 4 Msps in; decimated by 8: 16 384 samples at 500 ksps out (quickChain).
    expect(summary.input).toMatchObject({ path: `/api/captures/${captureId}`, datatype: 'cf32_le', layout: 'complex', sampleRate: 4e6, samples: 131_072 });
    expect(summary.input.durationSeconds).toBeCloseTo(131_072 / 4e6, 12);
    expect(summary.output).toMatchObject({ datatype: 'cf32_le', layout: 'complex', sampleRate: 500_000, samples: 16_384 });
    // A probed stage without a measuring kind keeps a spectrum, a trace and (complex) a constellation.
    expect(summary.testPoints.map((p: any) => [p.stageId, p.plots])).toEqual([
      ['dec', ['spectrum', 'trace', 'constellation']],
      ['psd', ['spectrum']],
      ['meas', []],
    ]);
    // The 520 kHz tone mixed by -500 kHz sits at +20 kHz; amplitude 0.5 is a power of 0.25, i.e.
    // 10 log10(0.25) = -6.02 dBFS (0 dBFS is a full-scale complex tone, src/dsp/spectral/levels.ts).
    const psd = summary.testPoints.find((p: any) => p.stageId === 'psd').spectrum;
    expect(Math.abs(psd.peak.frequency - 20_000)).toBeLessThan(2 * psd.resolutionBandwidth);
    expect(psd.bins).toBe(1024);
    const readouts = Object.fromEntries(summary.testPoints.find((p: any) => p.stageId === 'meas').readouts.map((r: any) => [r.name, r]));
    expect(Math.abs(readouts['Tone frequency'].value - 20_000)).toBeLessThan(100);
    expect(readouts['Tone level']).toMatchObject({ unit: 'dBFS' });
    expect(readouts['Tone level'].value).toBeCloseTo(-6.02, 0);
  });

  it('export results.json in the command line\'s shape, and the same output samples', async () => {
    writeSigmf(join(work, 'beacon'), tone, 4e6);
    writeFileSync(join(work, 'chain.json'), JSON.stringify(quickChain(200_000, true)));
    const cli = await quadrille('run', '--chain', join(work, 'chain.json'), '--input', join(work, 'beacon.sigmf-meta'), '--out', join(work, 'out'), '--quiet');
    expect(cli.code, cli.stderr).toBe(0);
    const expected = JSON.parse(readFileSync(join(work, 'out', 'results.json'), 'utf8'));
    const exported = JSON.parse((await download(engineer, `/api/runs/${run.id}/export?format=json`)).bytes.toString('utf8'));
    expect(shape(exported)).toEqual(shape(expected));
    expect(exported.input.path).toBe(`/api/captures/${captureId}`);
    const data = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-data`);
    expect(data.bytes.equals(readFileSync(join(work, 'out', 'output.sigmf-data')))).toBe(true);
  }, 180_000);

  it('export as JSON, CSV and a SigMF pair that parse back', async () => {
    const json = await download(engineer, `/api/runs/${run.id}/export?format=json`);
    expect(json.status).toBe(200);
    expect(json.headers.get('content-disposition')).toMatch(/attachment; filename="run-[0-9a-f]{8}-results\.json"/);
    const results = JSON.parse(json.bytes.toString('utf8'));
    expect(results.output).toEqual(expect.objectContaining(run.summary.output));
    expect(results.probes.map((p: any) => p.stageId)).toEqual(['dec', 'psd', 'meas']);

    const psd = results.probes.find((probe: any) => probe.stageId === 'psd').spectrum;
    const spectrum = await download(engineer, `/api/runs/${run.id}/export?format=csv-spectrum&probe=psd`);
    expect(spectrum.headers.get('content-type')).toMatch(/^text\/csv/);
    const lines = spectrum.bytes.toString('utf8').trimEnd().split('\r\n');
    expect(lines[0]).toBe('frequency_hz,level_dBFS_per_Hz');
    expect(lines).toHaveLength(1024 + 1);
    const rows = lines.slice(1).map((line) => line.split(',').map(Number));
    expect(rows.map((row) => row[0])).toEqual(psd.frequencies);
    expect(rows.map((row) => row[1])).toEqual(psd.levels);
    // Bins 500 ksps / 1024 apart, from -250 kHz (a two-sided complex spectrum).
    expect(rows[1]![0]! - rows[0]![0]!).toBeCloseTo(500_000 / 1024, 6);
    expect((await engineer.get(`/api/runs/${run.id}/export?format=csv-spectrum&probe=meas`)).body.error).toMatchObject({ code: 'no_spectrum', field: 'probe' });

    const readouts = (await download(engineer, `/api/runs/${run.id}/export?format=csv-readouts`)).bytes.toString('utf8').trimEnd().split('\r\n');
    expect(readouts[0]).toBe('probe,name,value,unit,flags,reason,definition');
    const expected = results.probes.flatMap((probe: any) =>
      (probe.readouts ?? []).map((r: any) => [probe.stageId, r.name, r.value, r.unit, (r.flags ?? []).join(' '), r.reason ?? '', r.definition ?? '']),
    );
    expect(expected.length).toBeGreaterThan(3);
    const parsed = readouts.slice(1).map((line) => {
      const [probe, name, value, unit, flags, reason, definition] = csvCells(line);
      return [probe, name, value === '' ? null : Number(value), unit, flags, reason, definition];
    });
    expect(parsed).toEqual(expected);

    const meta = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-meta`);
    const parsedMeta = parseSigmfMeta(meta.bytes.toString('utf8'));
    expect(parsedMeta.global).toMatchObject({ datatype: 'cf32_le', sampleRate: 500_000, version: '1.2.0' });
    const data = await download(engineer, `/api/runs/${run.id}/export?format=sigmf-data`);
    // cf32_le: 8 bytes per complex sample.
    expect(data.headers.get('content-length')).toBe(String(16_384 * 8));
    // core:sha512 is the hash of the data file (SigMF v1.2 global core:sha512).
    expect(parsedMeta.global.sha512).toBe(createHash('sha512').update(data.bytes).digest('hex'));

    const bad = await engineer.get(`/api/runs/${run.id}/export?format=xlsx`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('format');
  });

  it('plot data never has more points than the width, and every bin is there on request', async () => {
    const full = await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=spectrum&full=1`);
    expect(full.status, full.text).toBe(200);
    expect(full.body.frequencies).toHaveLength(1024);
    const spectrum = await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=spectrum&width=100`);
    expect(spectrum.status).toBe(200);
    expect(spectrum.body.frequencies.length).toBeLessThanOrEqual(100);
    expect(spectrum.body.levels).toHaveLength(spectrum.body.frequencies.length);
    expect(spectrum.body.bins).toBe(1024);
    // Max per column keeps the peak bin at its own frequency, the +20 kHz tone.
    const top = Math.max(...full.body.levels);
    expect(Math.max(...spectrum.body.levels)).toBe(top);
    const topFrequency = spectrum.body.frequencies[spectrum.body.levels.indexOf(top)];
    expect(topFrequency).toBe(full.body.frequencies[full.body.levels.indexOf(top)]);
    expect(Math.abs(topFrequency - 20_000)).toBeLessThan(1000);

    const trace = await engineer.get(`/api/runs/${run.id}/plot?probe=dec&kind=trace&width=50`);
    expect(trace.status, trace.text).toBe(200);
    expect(trace.body.channels).toHaveLength(2);
    for (const channel of trace.body.channels) {
      expect(channel.min.length).toBeLessThanOrEqual(50);
      // A tone of amplitude 0.5 plus 1e-3 of dither swings I and Q through about ±0.5.
      expect(Math.min(...channel.min)).toBeCloseTo(-0.5, 1);
      expect(Math.max(...channel.max)).toBeCloseTo(0.5, 1);
    }
    const constellation = await engineer.get(`/api/runs/${run.id}/plot?probe=dec&kind=constellation&width=64`);
    expect(constellation.body.points.length / 2).toBeLessThanOrEqual(64);
    // The tone's points lie on the circle of radius 0.5 (the median ignores the filter's first samples).
    const radii: number[] = [];
    for (let k = 0; k < constellation.body.points.length; k += 2) radii.push(Math.hypot(constellation.body.points[k], constellation.body.points[k + 1]));
    radii.sort((a, b) => a - b);
    expect(radii[radii.length >> 1]).toBeCloseTo(0.5, 1);
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=nope&kind=spectrum&width=100`)).body.error).toMatchObject({ code: 'not_found', field: 'probe' });
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=trace&width=100`)).status).toBe(404);
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=psd&kind=spectrum&width=1`)).status).toBe(400);
    expect((await engineer.get(`/api/runs/${run.id}/plot?probe=dec&kind=trace&full=1`)).body.error).toMatchObject({ field: 'full' });
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

/** The cells of one CSV line as RFC 4180 writes them: quoted cells may hold commas and doubled quotes. */
function csvCells(line: string): string[] {
  const cells: string[] = [];
  let at = 0;
  while (at <= line.length) {
    if (line[at] === '"') {
      let text = '';
      at++;
      while (at < line.length) {
        if (line[at] === '"' && line[at + 1] === '"') {
          text += '"';
          at += 2;
        } else if (line[at] === '"') {
          at++;
          break;
        } else text += line[at++];
      }
      cells.push(text);
      at++; // the comma after the closing quote
    } else {
      const end = line.indexOf(',', at);
      cells.push(line.slice(at, end === -1 ? line.length : end));
      at = end === -1 ? line.length + 1 : end + 1;
    }
  }
  return cells;
}
