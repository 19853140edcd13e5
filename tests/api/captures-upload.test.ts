/**
 * One-request upload (POST /api/captures) against the built server: every datatype and layout
 * round-trips byte for byte, WAV and .sigmf bodies fill the metadata, Range requests follow
 * RFC 9110, and every bad upload answers its 4xx naming the field and leaves no row and no bytes.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeWav, SIGMF_DATATYPES } from '@/dsp/formats';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { download, expectNothingLeft, sampleBytes, send, sha256, signedIn, snapshot, storedObjects, upload, uploadStreamed } from './captures-helpers';

let server: TestServer;
let engineer: Client;
let operator: Client;
let work: string;

beforeAll(async () => {
  process.env.QUADRILLE_DEMO_CAPTURES = '0';
  server = await startServer({ env: { QUADRILLE_QUOTA_STORAGE_BYTES: '64MiB', QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: '16MiB' } });
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
  operator = await signedIn(server, 'operator@saltmarsh.test');
  work = mkdtempSync(join(tmpdir(), 'quadrille-captures-test-'));
});
afterAll(async () => {
  await server?.stop();
  rmSync(work, { recursive: true, force: true });
});

const cases = SIGMF_DATATYPES.flatMap((datatype) =>
  (datatype.startsWith('c') ? (['complex'] as const) : (['real', 'real-pair'] as const)).map((layout) => ({ datatype, layout })),
);

describe('upload then download', () => {
  it.each(cases)('$datatype $layout gives identical bytes and the right counts', async ({ datatype, layout }) => {
    const samples = 3_001;
    const bytes = sampleBytes(datatype, layout, samples);
    const created = await upload(engineer, bytes, { name: `${datatype} ${layout}`, datatype, layout, sample_rate: 2.5e6, center_frequency: 433.92e6 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const capture = created.body;
    expect(capture).toMatchObject({ datatype, layout, sampleRate: 2.5e6, centerFrequency: 433.92e6, sampleCount: samples, byteSize: bytes.length, sha256: sha256(bytes), source: 'uploaded', visibility: 'private' });
    expect(capture.bytesPerSample * samples).toBe(bytes.length);
    expect(capture.durationSeconds).toBeCloseTo(samples / 2.5e6, 12);
    expect(sha256(await download(engineer, capture.id))).toBe(sha256(bytes));
  });

  it('streams a chunked body (no Content-Length) the same way', async () => {
    const bytes = sampleBytes('cf32_le', 'complex', 50_000);
    const created = await uploadStreamed(engineer, bytes, { name: 'chunked', datatype: 'cf32_le', sample_rate: 1e6 });
    expect(created.status).toBe(201);
    expect(created.body.sha256).toBe(sha256(bytes));
    expect(Buffer.from(await download(engineer, created.body.id)).equals(Buffer.from(bytes))).toBe(true);
  });

  it('lets an operator upload too', async () => {
    const created = await upload(operator, sampleBytes('ci8', 'complex', 100), { name: 'operator upload', datatype: 'ci8', sample_rate: 1e6 });
    expect(created.status).toBe(201);
    expect(created.body.owner.name).toBe('Priya Halloran');
  });
});

describe('file formats fill the metadata', () => {
  it('a two-channel 16-bit WAV becomes ri16_le real-pair at the header rate, samples unchanged', async () => {
    const values = new Float32Array(2 * 1_000).map((_, k) => Math.sin(k / 7) * 0.5);
    const wav = encodeWav({ sampleRate: 48_000, channels: 2, sampleFormat: 'pcm16' }, values);
    const created = await upload(engineer, wav, { name: 'bench wav', format: 'wav', center_frequency: 10.7e6 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body).toMatchObject({ datatype: 'ri16_le', layout: 'real-pair', sampleRate: 48_000, sampleCount: 1_000, centerFrequency: 10.7e6 });
    // RIFF/WAVE (Microsoft/IBM 1991): a plain PCM header is 44 bytes, the data chunk follows.
    expect(Buffer.from(await download(engineer, created.body.id)).equals(Buffer.from(wav.subarray(44)))).toBe(true);
  });

  it('a two-channel WAV declared complex becomes ci16_le I/Q; mono float becomes rf32_le', async () => {
    const stereo = encodeWav({ sampleRate: 96_000, channels: 2, sampleFormat: 'pcm16' }, new Float32Array(64).fill(0.25));
    const iq = await upload(engineer, stereo, { name: 'iq wav', format: 'wav', layout: 'complex' });
    expect(iq.body).toMatchObject({ datatype: 'ci16_le', layout: 'complex', sampleCount: 32 });
    const mono = encodeWav({ sampleRate: 8_000, channels: 1, sampleFormat: 'float32' }, new Float32Array(100).fill(-0.5));
    const real = await upload(engineer, mono, { name: 'float wav', format: 'wav' });
    expect(real.body).toMatchObject({ datatype: 'rf32_le', layout: 'real', sampleCount: 100, sampleRate: 8_000 });
  });

  it('a .sigmf archive made by tar gives datatype, rate, frequency, notes and annotations from its meta', async () => {
    const data = sampleBytes('ci16_le', 'complex', 2_048);
    const folder = join(work, 'beacon');
    execFileSync('mkdir', ['-p', folder]);
    const meta = {
      global: { 'core:datatype': 'ci16_le', 'core:version': '1.2.0', 'core:sample_rate': 4e6, 'core:description': 'Bench 1, rev A' },
      captures: [{ 'core:sample_start': 0, 'core:frequency': 2.412e9 }],
      annotations: [{ 'core:sample_start': 100, 'core:sample_count': 400, 'core:label': 'beacon', 'core:freq_lower_edge': 2.4123e9, 'core:freq_upper_edge': 2.4129e9 }],
    };
    writeFileSync(join(folder, 'beacon.sigmf-meta'), JSON.stringify(meta));
    writeFileSync(join(folder, 'beacon.sigmf-data'), data);
    // GNU tar writes the archive (ustar, POSIX 1003.1), members in the order given.
    execFileSync('tar', ['--format=ustar', '-cf', join(work, 'beacon.sigmf'), '-C', work, 'beacon/beacon.sigmf-meta', 'beacon/beacon.sigmf-data']);
    const archive = readFileSync(join(work, 'beacon.sigmf'));
    const created = await upload(engineer, archive, { format: 'sigmf', tags: 'rev-a' });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body).toMatchObject({
      name: 'beacon',
      datatype: 'ci16_le',
      layout: 'complex',
      sampleRate: 4e6,
      centerFrequency: 2.412e9,
      notes: 'Bench 1, rev A',
      tags: ['rev-a'],
      sampleCount: 2_048,
      sha256: sha256(data),
    });
    expect(created.body.annotations).toEqual([meta.annotations[0]]);
  });

  it('a 24-bit WAV is stored widened to 32-bit with the same full scale, an odd data length refused', async () => {
    const values = new Float32Array(2 * 999).map((_, k) => Math.cos(k / 5) * 0.9);
    const wav = encodeWav({ sampleRate: 192_000, channels: 2, sampleFormat: 'pcm24' }, values);
    const created = await upload(engineer, wav, { name: '24-bit iq', format: 'wav', layout: 'complex' });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body).toMatchObject({ datatype: 'ci32_le', layout: 'complex', sampleCount: 999, sampleRate: 192_000, byteSize: 999 * 8 });
    expect(created.body.notes).toMatch(/24-bit PCM WAV/);
    // RIFF/WAVE (Microsoft/IBM 1991): 24-bit PCM is signed little-endian, 3 bytes a value, after a
    // 44-byte plain header. Widened, each value is the same two's-complement number times 2^8 in a
    // little-endian int32 (SigMF ci32_le), so value / 2^31 equals the 24-bit value / 2^23.
    const stored = Buffer.from(await download(engineer, created.body.id));
    const file = Buffer.from(wav.subarray(44));
    for (let k = 0; k < 2 * 999; k++) expect(stored.readInt32LE(4 * k)).toBe(file.readIntLE(3 * k, 3) * 256);
    expect(sha256(stored)).toBe(created.body.sha256);

    const before = await snapshot(server);
    const mono = encodeWav({ sampleRate: 48_000, channels: 2, sampleFormat: 'pcm24' }, new Float32Array(10));
    // Cut the data chunk to 59 bytes (not a whole number of 6-byte frames) and say so in its size.
    const odd = Buffer.from(mono.subarray(0, 44 + 59));
    odd.writeUInt32LE(59, 40);
    odd.writeUInt32LE(36 + 59, 4);
    const refused = await upload(engineer, odd, { name: 'odd 24-bit', format: 'wav' });
    expect(refused.status).toBe(422);
    expect(refused.body.error.field).toBe('body');
    expect(refused.body.error.message).toMatch(/59 bytes is not a whole number of 6-byte frames/);
    await expectNothingLeft(server, before);
  });

  it('refuses an archive whose data comes before its meta, naming why', async () => {
    const before = await snapshot(server);
    execFileSync('tar', ['--format=ustar', '-cf', join(work, 'reversed.sigmf'), '-C', work, 'beacon/beacon.sigmf-data', 'beacon/beacon.sigmf-meta']);
    const reversed = await upload(engineer, readFileSync(join(work, 'reversed.sigmf')), { format: 'sigmf' });
    expect(reversed.status).toBe(422);
    expect(reversed.body.error.field).toBe('body');
    expect(reversed.body.error.message).toMatch(/before its \.sigmf-meta/);
    await expectNothingLeft(server, before);
  });
});

describe('Range requests', () => {
  let id: string;
  let bytes: Uint8Array;
  beforeAll(async () => {
    bytes = sampleBytes('cu8', 'complex', 5_000);
    id = (await upload(engineer, bytes, { name: 'ranges', datatype: 'cu8', sample_rate: 1e6 })).body.id;
  });

  // RFC 9110 sections 14.1.2 (byte ranges, suffix ranges), 14.4 (Content-Range), 15.3.7 (206), 15.5.17 (416).
  it.each([
    ['bytes=0-99', 0, 99],
    ['bytes=9000-', 9_000, 9_999],
    ['bytes=-16', 9_984, 9_999],
    ['bytes=9990-20000', 9_990, 9_999],
  ])('%s answers 206 with exactly those bytes', async (range, start, end) => {
    const response = await send(engineer, 'GET', `/api/captures/${id}/data`, { headers: { range } });
    expect(response.status).toBe(206);
    expect(response.headers.get('content-range')).toBe(`bytes ${start}-${end}/10000`);
    expect(response.headers.get('content-length')).toBe(String(end - start + 1));
    expect(Buffer.from(response.bytes).equals(Buffer.from(bytes.subarray(start, end + 1)))).toBe(true);
  });

  it('answers HEAD with the headers alone', async () => {
    const response = await send(engineer, 'HEAD', `/api/captures/${id}/data`);
    expect(response.status).toBe(200);
    expect(response.headers.get('content-length')).toBe('10000');
    expect(response.bytes.length).toBe(0);
  });

  it('answers 416 with the size for a range past the end, and 200 with Accept-Ranges without one', async () => {
    const past = await send(engineer, 'GET', `/api/captures/${id}/data`, { headers: { range: 'bytes=10000-' } });
    expect(past.status).toBe(416);
    expect(past.headers.get('content-range')).toBe('bytes */10000');
    const whole = await send(engineer, 'GET', `/api/captures/${id}/data`);
    expect(whole.status).toBe(200);
    expect(whole.headers.get('accept-ranges')).toBe('bytes');
    expect(whole.headers.get('content-disposition')).toMatch(/^attachment; filename="ranges\.sigmf-data"/);
  });
});

describe('bad uploads answer a 4xx naming the field and leave nothing behind', () => {
  const good = { name: 'bad', datatype: 'cf32_le', sample_rate: 1e6 };
  const eight = sampleBytes('cf32_le', 'complex', 64);
  const cases: Array<[string, Record<string, string | number>, Uint8Array, number, string, string]> = [
    ['unknown datatype', { ...good, datatype: 'cf16_le' }, eight, 400, 'invalid_field', 'datatype'],
    ['sample rate 0', { ...good, sample_rate: 0 }, eight, 400, 'invalid_field', 'sample_rate'],
    ['negative sample rate', { ...good, sample_rate: -48000 }, eight, 400, 'invalid_field', 'sample_rate'],
    ['non-numeric sample rate', { ...good, sample_rate: '2 MHz' }, eight, 400, 'invalid_field', 'sample_rate'],
    ['non-finite centre frequency', { ...good, center_frequency: 'Infinity' }, eight, 400, 'invalid_field', 'center_frequency'],
    ['NaN centre frequency', { ...good, center_frequency: 'NaN' }, eight, 400, 'invalid_field', 'center_frequency'],
    ['missing name', { datatype: 'cf32_le', sample_rate: 1e6 }, eight, 400, 'required', 'name'],
    ['missing datatype', { name: 'x', sample_rate: 1e6 }, eight, 400, 'required', 'datatype'],
    ['layout that does not fit the datatype', { ...good, layout: 'real' }, eight, 400, 'invalid_field', 'layout'],
    ['unknown parameter', { ...good, samplerate: 5 }, eight, 400, 'unknown_field', 'samplerate'],
    ['byte count not whole samples', good, eight.subarray(0, 8 * 64 - 3), 422, 'invalid_body', 'body'],
    ['empty body', good, new Uint8Array(0), 422, 'invalid_body', 'body'],
    ['too large for one capture', good, new Uint8Array(17 * 1024 * 1024), 413, 'capture_too_large', null as unknown as string],
  ];

  it.each(cases)('%s', async (_label, params, body, status, code, field) => {
    const before = await snapshot(server);
    const response = await upload(engineer, body, params);
    expect(response.status, JSON.stringify(response.body)).toBe(status);
    expect(response.body.error.code).toBe(code);
    expect(response.body.error.field).toBe(field);
    expect(response.body.error.message.length).toBeGreaterThan(10);
    await expectNothingLeft(server, before);
  });

  it('finds a partial last sample and an oversize body mid-stream too (no Content-Length)', async () => {
    const before = await snapshot(server);
    const partial = await uploadStreamed(engineer, sampleBytes('ci16_le', 'complex', 10_000).subarray(0, 39_998), { ...good, datatype: 'ci16_le' });
    expect(partial.status).toBe(422);
    expect(partial.body.error).toMatchObject({ code: 'invalid_body', field: 'body' });
    expect(partial.body.error.message).toMatch(/39998 bytes is not a whole number of 4-byte samples/);
    const oversize = await uploadStreamed(engineer, new Uint8Array(20 * 1024 * 1024), { ...good, datatype: 'ci16_le' }, 256 * 1024);
    expect(oversize.status).toBe(413);
    expect(oversize.body.error.code).toBe('capture_too_large');
    await expectNothingLeft(server, before);
  });

  it('refuses NaN and infinite float samples, naming the sample', async () => {
    const before = await snapshot(server);
    const bytes = sampleBytes('cf32_le', 'complex', 1_000);
    new DataView(bytes.buffer, bytes.byteOffset).setFloat32(8 * 700 + 4, Number.NaN, true);
    const response = await uploadStreamed(engineer, bytes, good);
    expect(response.status).toBe(422);
    expect(response.body.error.field).toBe('body');
    expect(response.body.error.message).toMatch(/sample 700 \(Q\) is NaN/);
    await expectNothingLeft(server, before);
  });

  it('refuses a truncated WAV (data chunk shorter than its header says)', async () => {
    const before = await snapshot(server);
    const wav = encodeWav({ sampleRate: 48_000, channels: 1, sampleFormat: 'pcm16' }, new Float32Array(2_000).fill(0.1));
    const response = await upload(engineer, wav.subarray(0, 44 + 1_000), { name: 'short', format: 'wav' });
    expect(response.status).toBe(422);
    expect(response.body.error).toMatchObject({ code: 'truncated', field: 'body' });
    await expectNothingLeft(server, before);
  });

  it('refuses a body that is not a WAV file at all', async () => {
    const before = await snapshot(server);
    const response = await upload(engineer, new TextEncoder().encode('hello, this is not audio at all'), { name: 'text', format: 'wav' });
    expect(response.status).toBe(422);
    expect(response.body.error.field).toBe('body');
    expect(response.body.error.message).toMatch(/RIFF/);
    await expectNothingLeft(server, before);
  });
});

describe('per-user quota', () => {
  it('uses the user_quotas override: a capture that would pass the storage quota answers 413 quota_exceeded', async () => {
    const operatorId = (await server.db('users').where({ email: 'operator@saltmarsh.test' }).first()).id;
    await server.db('user_quotas').insert({ user_id: operatorId, storage_bytes: 300_000, largest_capture_bytes: null, updated_at: new Date().toISOString() });
    const first = await upload(operator, sampleBytes('ci16_le', 'complex', 50_000), { name: 'first', datatype: 'ci16_le', sample_rate: 1e6 });
    expect(first.status).toBe(201);
    const before = await snapshot(server);
    const second = await upload(operator, sampleBytes('ci16_le', 'complex', 50_000), { name: 'second', datatype: 'ci16_le', sample_rate: 1e6 });
    expect(second.status).toBe(413);
    expect(second.body.error.code).toBe('quota_exceeded');
    expect(second.body.error.message).toMatch(/of 300000 bytes are used/);
    const streamed = await uploadStreamed(operator, sampleBytes('ci16_le', 'complex', 50_000), { name: 'third', datatype: 'ci16_le', sample_rate: 1e6 });
    expect(streamed.status).toBe(413);
    await expectNothingLeft(server, before);
    const usage = (await operator.get('/api/captures?owner=me')).body.usage;
    expect(usage).toMatchObject({ quotaBytes: 300_000, largestCaptureBytes: 16 * 1024 * 1024 });
    expect(usage.storedBytes).toBe(first.body.byteSize + 200);
  });
});

describe('duplicates', () => {
  it('answers 409 duplicate with the existing capture and keeps no second copy', async () => {
    const bytes = sampleBytes('ri16_le', 'real', 4_000);
    const first = await upload(engineer, bytes, { name: 'original', datatype: 'ri16_le', sample_rate: 1e6 });
    expect(first.status).toBe(201);
    const before = await snapshot(server);
    const again = await uploadStreamed(engineer, bytes, { name: 'copy', datatype: 'ri16_le', sample_rate: 1e6 });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('duplicate');
    expect(again.body.capture).toMatchObject({ id: first.body.id, name: 'original' });
    await expectNothingLeft(server, before);
    expect(storedObjects(server)).toContain(`captures/${first.body.id}`);
  });

  it('POST /api/captures/check offers the existing capture by sha256 and checks the rules before any byte', async () => {
    const bytes = sampleBytes('cf64_le', 'complex', 10);
    const first = await upload(engineer, bytes, { name: 'checked', datatype: 'cf64_le', sample_rate: 1e6 });
    const check = (body: object) => engineer.post('/api/captures/check', { name: 'n', datatype: 'cf64_le', sampleRate: 1e6, byteSize: 160, ...body });
    expect((await check({ sha256: first.body.sha256 })).body).toMatchObject({ ok: true, duplicate: { id: first.body.id } });
    expect((await check({})).body).toEqual({ ok: true });
    expect((await check({ byteSize: 161 })).body.error).toMatchObject({ code: 'invalid_field', field: 'byteSize' });
    expect((await check({ sampleRate: -1 })).body.error).toMatchObject({ field: 'sampleRate' });
    expect((await check({ centerFrequency: 'x' })).body.error).toMatchObject({ field: 'centerFrequency' });
    expect((await check({ datatype: 'cq16' })).body.error).toMatchObject({ field: 'datatype' });
    const big = await check({ byteSize: 32 * 1024 * 1024 });
    expect(big.status).toBe(413);
    expect(big.body.error).toMatchObject({ code: 'capture_too_large', field: 'byteSize' });
  });
});
