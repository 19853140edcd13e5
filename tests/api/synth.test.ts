/**
 * POST /api/synth and the demo seed: the stored bytes are exactly the synthesizer's bytes for the
 * spec (so the same form always gives the same capture), a bad spec names `spec.<field>`, the size
 * is checked against the quota before synthesis, and synthesized exports carry the playback caution.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoSynthSpecs, synthesizeBytes, TRANSMIT_CAUTION } from '@/dsp/synth';
import { startServer, type TestServer } from '../helpers/server';
import type { Client } from '../helpers/client';
import { download, expectNothingLeft, sha256, signedIn, snapshot } from './captures-helpers';
import { createHash } from 'node:crypto';

let server: TestServer;
let engineer: Client;
let operator: Client;

beforeAll(async () => {
  delete process.env.QUADRILLE_DEMO_CAPTURES;
  server = await startServer({ env: { QUADRILLE_QUOTA_LARGEST_CAPTURE_BYTES: '64MiB' } });
  engineer = await signedIn(server, 'engineer@saltmarsh.test');
  operator = await signedIn(server, 'operator@saltmarsh.test');
});
afterAll(async () => {
  await server?.stop();
});

/** SHA-256 of everything synthesizeBytes yields for `spec`. */
function synthesizedSha(spec: unknown): string {
  const hash = createHash('sha256');
  for (const chunk of synthesizeBytes(spec)) hash.update(chunk);
  return hash.digest('hex');
}

const spec = {
  sampleRate: 1e6,
  duration: 0.01,
  datatype: 'ci16_le',
  layout: 'complex',
  centerFrequency: 915e6,
  tones: [{ frequency: 125e3, level: -10, phase: 0 }],
  noise: { mode: 'total', level: -60 },
  seed: 77,
};

describe('POST /api/synth', () => {
  it('creates a synthesized capture holding the tone of the spec, which its stored spec makes again', async () => {
    const response = await engineer.post('/api/synth', { name: 'Test tone', visibility: 'team', notes: 'one tone', tags: ['synth'], spec });
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(response.body).toMatchObject({
      name: 'Test tone',
      source: 'synthesized',
      datatype: 'ci16_le',
      layout: 'complex',
      sampleRate: 1e6,
      centerFrequency: 915e6,
      sampleCount: 10_000,
      byteSize: 40_000,
      visibility: 'team',
      tags: ['synth'],
    });
    expect(response.body.synthSpec).toMatchObject({ ...spec, carriers: [], impairments: { gainImbalance: 0, adcBits: 0 } });
    const bytes = Buffer.from(await download(engineer, response.body.id));
    expect(response.body.sha256).toBe(sha256(bytes));
    // Independent of the synthesizer: a complex tone of level L dBFS is A e^{j 2 pi f n / fs} with
    // A = 10^(L/20) of full scale (SigMF ci16: 32768), so over N = 10,000 samples at 1 Msps (a whole
    // 1,250 cycles of 125 kHz) its DFT bin k = 1250 is A N: A = 10^(-10/20) = 0.31623. The -60 dBFS
    // noise and 16-bit rounding move that by well under 1e-3.
    const n = 10_000;
    let re = 0;
    let im = 0;
    for (let k = 0; k < n; k++) {
      const i = bytes.readInt16LE(4 * k) / 32768;
      const q = bytes.readInt16LE(4 * k + 2) / 32768;
      const angle = (-2 * Math.PI * 1250 * k) / n;
      re += i * Math.cos(angle) - q * Math.sin(angle);
      im += i * Math.sin(angle) + q * Math.cos(angle);
    }
    expect(Math.hypot(re, im) / n).toBeCloseTo(0.31623, 3);
    // The stored spec makes the same bytes again: the same form always gives the same capture.
    expect(synthesizedSha(response.body.synthSpec)).toBe(sha256(bytes));
  });

  it('the same spec again is a 409 duplicate of the first capture', async () => {
    const response = await operator.post('/api/synth', { name: 'mine', spec });
    expect(response.status).toBe(201);
    const again = await operator.post('/api/synth', { name: 'mine again', spec });
    expect(again.status).toBe(409);
    expect(again.body.capture.id).toBe(response.body.id);
  });

  it.each([
    [{ ...spec, tones: [{ frequency: 700e3, level: -10 }] }, 'spec.tones[0].frequency'],
    [{ ...spec, sampleRate: -1 }, 'spec.sampleRate'],
    [{ ...spec, datatype: 'cf128_le' }, 'spec.datatype'],
    [{ ...spec, layout: 'real' }, 'spec.layout'],
    [{ ...spec, noise: { mode: 'total', level: 30 } }, 'spec.noise.level'],
    [{ ...spec, carriers: [{ modulation: 'qpsk', symbolRate: 5e6 }] }, 'spec.carriers[0].symbolRate'],
  ])('refuses a bad spec naming %#: %s', async (bad, field) => {
    const before = await snapshot(server);
    const response = await engineer.post('/api/synth', { name: 'bad', spec: bad });
    expect(response.status, JSON.stringify(response.body)).toBe(400);
    expect(response.body.error.field).toBe(field);
    expect(response.body.error.message).toContain(field);
    await expectNothingLeft(server, before);
  });

  it('refuses a missing name or spec, and a capture over the quota before synthesizing it', async () => {
    const before = await snapshot(server);
    expect((await engineer.post('/api/synth', { spec })).body.error).toMatchObject({ code: 'required', field: 'name' });
    expect((await engineer.post('/api/synth', { name: 'x' })).body.error).toMatchObject({ field: 'spec' });
    // 100 Msps for 10 s of cf32 is 8 GB: refused from the spec's size alone (nothing synthesized, nothing stored).
    const huge = await engineer.post('/api/synth', { name: 'huge', spec: { ...spec, datatype: 'cf32_le', sampleRate: 100e6, duration: 10 } });
    expect(huge.status).toBe(413);
    expect(huge.body.error).toMatchObject({ code: 'capture_too_large', field: 'spec.duration' });
    await expectNothingLeft(server, before);
  });

  it('puts the playback caution into the exported meta of a synthesized capture', async () => {
    // A capture of its own (another seed, so not a duplicate of the first test's).
    const created = await engineer.post('/api/synth', { name: 'Caution tone', notes: 'one tone', spec: { ...spec, seed: 78 } });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const id = created.body.id;
    const meta = await engineer.get(`/api/captures/${id}/export?format=sigmf-meta`);
    expect(meta.body.global['core:description']).toBe(`one tone\n\n${TRANSMIT_CAUTION}`);
  });
});

describe('demo seed', () => {
  it('made the four demo captures for the demo engineer, team-visible, byte for byte the synthesizer output', async () => {
    const listed = await operator.get('/api/captures?tag=saltmarsh&sort=name&order=asc');
    expect(listed.body.total).toBe(demoSynthSpecs.length);
    for (const demo of demoSynthSpecs) {
      const capture = listed.body.items.find((item: { name: string }) => item.name === demo.name);
      expect(capture, demo.name).toBeDefined();
      expect(capture).toMatchObject({ source: 'synthesized', visibility: 'team', owner: { name: 'Teodor Lindqvist' }, notes: demo.description, tags: demo.tags });
      expect(capture.datatype).toBe(demo.spec.datatype);
      // Sample count by hand from the demo spec: rate times duration (e.g. 4 Msps for 0.25 s is 1,000,000).
      expect(capture.sampleCount).toBe(Math.round(demo.spec.sampleRate! * demo.spec.duration!));
    }
    const first = listed.body.items[0];
    expect(sha256(await download(operator, first.id))).toBe(first.sha256);
  });

  it('marks the beacon and the interferer on every demo capture with SigMF annotations over the whole capture', async () => {
    const listed = await operator.get('/api/captures?tag=saltmarsh');
    for (const capture of listed.body.items) {
      const labels = capture.annotations.map((a: Record<string, unknown>) => a['core:label']);
      expect(labels, capture.name).toEqual(['Node beacon', 'CW interferer']);
      const [beacon, interferer] = capture.annotations;
      expect(beacon['core:sample_start']).toBe(0);
      expect(beacon['core:sample_count']).toBe(capture.sampleCount);
      // Scenario: beacon 600 kHz above the 2.412 GHz LO (DESIGN.md), interferer 1.35 MHz below it (the
      // demo's own choice), in RF for every variant. An RRC signal occupies symbol rate x (1 + roll-off):
      // 250 k x 1.35 (common practice).
      expect((beacon['core:freq_lower_edge'] + beacon['core:freq_upper_edge']) / 2).toBeCloseTo(2.4126e9, 0);
      expect(beacon['core:freq_upper_edge'] - beacon['core:freq_lower_edge']).toBeCloseTo(337_500, 0);
      expect((interferer['core:freq_lower_edge'] + interferer['core:freq_upper_edge']) / 2).toBeCloseTo(2.41065e9, 0);
    }
  });
});
