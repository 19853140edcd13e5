/**
 * The command line, run as a child process on small generated captures. Expected tone
 * frequencies follow from the signals' own definitions; the WAV files come from our writer (its
 * byte layout is checked against the RIFF/WAVE spec in tests/dsp/formats-wav.test.ts).
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { encodeWav, parseSigmfMeta } from '@/dsp/formats';
import { complexTone, quadrille, writeChain, writeSigmf } from './cli-helpers';

let dir = '';
const FS = 1e6;
const TONE = 123_000;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'quadrille-cli-'));
  writeSigmf(join(dir, 'tone'), complexTone(50_000, FS, TONE), FS, { 'core:description': 'Saltmarsh test tone' }, 'cf32_le', 2.4e9);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const mixChain = () => writeChain(dir, 'mix.json', [{ id: 'nco', kind: 'mix', params: { frequency: -100_000 }, probe: true }]);

describe('quadrille run', () => {
  it('writes results.json and a SigMF output pair; the tone shows as the probe peak', async () => {
    const out = join(dir, 'run1');
    const r = await quadrille('run', '--chain', mixChain(), '--input', join(dir, 'tone.sigmf-meta'), '--out', out);
    expect(r.stderr).toMatch(/done in/);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(readdirSync(out).sort()).toEqual(['output.sigmf-data', 'output.sigmf-meta', 'results.json']);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    expect(results.engineVersion).toMatch(/^\d+\.\d+\.\d+/);
    expect(results.input).toMatchObject({ container: 'sigmf', datatype: 'cf32_le', layout: 'complex', sampleRate: FS, centerFrequency: 2.4e9, samples: 50_000 });
    const probe = results.probes.find((p: { stageId: string }) => p.stageId === 'nco');
    expect(probe.kind).toBe('mix');
    // common practice: mixing by e^{j 2 pi f t} with f = -100 kHz moves a tone at 123 kHz to 23 kHz.
    const bin = FS / probe.spectrum.frequencies.length;
    expect(Math.abs(probe.spectrum.peak.frequency - (TONE - 100_000))).toBeLessThan(bin / 2);
    expect(probe.spectrum.frequencies).toHaveLength(probe.spectrum.levels.length);

    const meta = parseSigmfMeta(readFileSync(join(out, 'output.sigmf-meta'), 'utf8'));
    expect(meta.global).toMatchObject({ datatype: 'cf32_le', sampleRate: FS, numChannels: 1 });
    expect(meta.captures[0].frequency).toBe(2.4e9 + 100_000);
    const data = new Float32Array(readFileSync(join(out, 'output.sigmf-data')).buffer.slice(0));
    expect(data.length).toBe(2 * 50_000);
    const expected = complexTone(50_000, FS, TONE - 100_000);
    let worst = 0;
    for (let k = 0; k < data.length; k++) worst = Math.max(worst, Math.abs(data[k] - expected[k]));
    expect(worst).toBeLessThan(1e-5); // float32 arithmetic on amplitude 0.5
  });

  it('reads a two-channel 16-bit WAV as complex I/Q when asked, and a mono WAV as real (rf32_le out)', async () => {
    const iq = complexTone(20_000, 48_000, 6_000, 0.5);
    writeFileSync(join(dir, 'iq.wav'), encodeWav({ sampleRate: 48_000, channels: 2, sampleFormat: 'pcm16' }, iq));
    const out = join(dir, 'run-wav');
    const r = await quadrille('run', '--chain', writeChain(dir, 'g.json', [{ id: 'g', kind: 'gain', params: { mode: 'fixed', gainDb: 0 }, probe: true }]), '--input', join(dir, 'iq.wav'), '--layout', 'complex', '--out', out);
    expect(r.stderr).not.toMatch(/error/);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    expect(results.input).toMatchObject({ container: 'wav', layout: 'complex', sampleRate: 48_000, samples: 20_000 });
    const peak = results.probes[0].spectrum.peak.frequency;
    expect(Math.abs(peak - 6_000)).toBeLessThan(48_000 / results.probes[0].spectrum.frequencies.length);

    const real = new Float32Array(20_000).map((_, n) => 0.5 * Math.cos((2 * Math.PI * 5_000 * n) / 48_000));
    writeFileSync(join(dir, 'real.wav'), encodeWav({ sampleRate: 48_000, channels: 1, sampleFormat: 'pcm24', extensible: true }, real));
    const out2 = join(dir, 'run-wav-real');
    expect((await quadrille('run', '--chain', join(dir, 'g.json'), '--input', join(dir, 'real.wav'), '--out', out2)).code).toBe(0);
    const meta = parseSigmfMeta(readFileSync(join(out2, 'output.sigmf-meta'), 'utf8'));
    expect(meta.global.datatype).toBe('rf32_le');
    const r2 = JSON.parse(readFileSync(join(out2, 'results.json'), 'utf8'));
    expect(Math.abs(r2.probes[0].spectrum.peak.frequency - 5_000)).toBeLessThan(48_000 / 2 / r2.probes[0].spectrum.frequencies.length * 2);
  });

  it('runs the benchmark chain (mix, FIR, decimate, Welch) and reports the tone at its baseband frequency', async () => {
    // Tone at +1.30 MHz, mixed by -1.25 MHz: 50 kHz after the mix (common practice), inside the
    // 400 kHz low-pass, so it survives decimation by 8 at 1.25 Msps.
    writeSigmf(join(dir, 'ddc'), complexTone(1 << 18, 10e6, 1.3e6, 0.5), 10e6);
    const out = join(dir, 'run-ddc');
    const r = await quadrille('run', '--chain', join(__dirname, 'bench/reference-ddc.chain.json'), '--input', join(dir, 'ddc.sigmf-meta'), '--out', out);
    expect(r.code).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    const psd = results.probes.find((p: { stageId: string }) => p.stageId === 'psd');
    expect(psd.kind).toBe('spectrum');
    expect(psd.spectrum.unit).toBe('dBFS/Hz');
    expect(psd.spectrum.frequencies).toHaveLength(4096);
    expect(Math.abs(psd.spectrum.peak.frequency - 50_000)).toBeLessThan(1.25e6 / 4096 / 2);
    expect(results.output).toMatchObject({ datatype: 'cf32_le', sampleRate: 1.25e6, samples: (1 << 18) / 8 });
  });

  it('reads a raw ci16_be file described by options', async () => {
    const tone = complexTone(30_000, 2e6, -250_000, 0.7);
    const buf = Buffer.alloc(tone.length * 2);
    tone.forEach((v, k) => buf.writeInt16BE(Math.round(v * 32768), 2 * k));
    writeFileSync(join(dir, 'capture.bin'), buf);
    const out = join(dir, 'run-raw');
    const r = await quadrille('run', '--chain', mixChain(), '--input', join(dir, 'capture.bin'), '--datatype', 'ci16_be', '--sample-rate', '2e6', '--center-frequency', '915e6', '--out', out);
    expect(r.code).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    expect(results.input).toMatchObject({ container: 'raw', datatype: 'ci16_be', sampleRate: 2e6, centerFrequency: 915e6, samples: 30_000 });
    const s = results.probes[0].spectrum;
    expect(Math.abs(s.peak.frequency - (-250_000 - 100_000))).toBeLessThan(2e6 / s.frequencies.length / 2);
  });
});

describe('bad input: one clear line, non-zero exit, nothing written', () => {
  const expectFailure = async (args: string[], pattern: RegExp, code = 1) => {
    const out = join(dir, `fail-${Math.random().toString(36).slice(2)}`);
    const r = await quadrille(...args.map((a) => (a === 'OUT' ? out : a)));
    expect(r.stderr).toMatch(pattern);
    // Progress lines may come first; the error itself is exactly one line, and the last.
    const lines = r.stderr.trim().split('\n');
    expect(lines.filter((l) => l.startsWith('quadrille: error: '))).toHaveLength(1);
    expect(lines[lines.length - 1]).toMatch(/^quadrille: error: /);
    expect(r.code).toBe(code);
    expect(existsSync(out)).toBe(false);
  };

  it('a missing input file', async () => await expectFailure(['run', '--chain', mixChain(), '--input', join(dir, 'absent.cf32'), '--out', 'OUT'], /input: .*absent.cf32: no such file/));
  it('unknown datatype names it', async () => {
    writeFileSync(join(dir, 'x.raw'), new Uint8Array(16));
    await expectFailure(['run', '--chain', mixChain(), '--input', join(dir, 'x.raw'), '--datatype', 'cf16_le', '--sample-rate', '1e6', '--out', 'OUT'], /--datatype: unknown datatype "cf16_le"/);
  });
  it('zero and negative sample rates', async () => {
    await expectFailure(['inspect', join(dir, 'x.raw'), '--datatype', 'cf32_le', '--sample-rate', '0'], /--sample-rate: must be > 0 Hz, got 0/);
    writeSigmf(join(dir, 'neg'), complexTone(16, FS, 0), -5);
    await expectFailure(['run', '--chain', mixChain(), '--input', join(dir, 'neg.sigmf-meta'), '--out', 'OUT'], /global.core:sample_rate: must be > 0 Hz, got -5/);
  });
  it('a byte count that is not whole samples', async () => {
    writeFileSync(join(dir, 'odd.raw'), new Uint8Array(21));
    await expectFailure(['run', '--chain', mixChain(), '--input', join(dir, 'odd.raw'), '--datatype', 'ci16_le', '--sample-rate', '1e6', '--out', 'OUT'], /21 bytes is not a whole number of 4-byte ci16_le complex samples/);
  });
  const writeNanCapture = () => {
    const values = complexTone(300_000, FS, TONE);
    values[2 * 200_001] = Number.NaN; // past the first 1 MiB read, so output files already exist
    writeSigmf(join(dir, 'nan'), values, FS);
  };
  it('NaN in the middle of float data: the run fails and leaves no files', async () => {
    writeNanCapture();
    await expectFailure(['run', '--chain', mixChain(), '--input', join(dir, 'nan.sigmf-meta'), '--out', 'OUT'], /sample 200001 \(I\) is NaN/);
  });
  it('a WAV whose header lies about its data size', async () => {
    const wav = encodeWav({ sampleRate: 8000, channels: 1, sampleFormat: 'pcm16' }, new Float32Array(100));
    writeFileSync(join(dir, 'short.wav'), wav.subarray(0, wav.length - 50));
    const gain = writeChain(dir, 'g0.json', [{ id: 'g', kind: 'gain', params: { mode: 'fixed', gainDb: 0 } }]);
    await expectFailure(['run', '--chain', gain, '--input', join(dir, 'short.wav'), '--out', 'OUT'], /short.wav: (riff|data)\.size: .*declares|truncated/);
  });
  it('an unknown stage kind in the chain', async () => {
    const chain = writeChain(dir, 'bad.json', [{ id: 'a', kind: 'mixer', params: {} }]);
    await expectFailure(['run', '--chain', chain, '--input', join(dir, 'tone.sigmf-meta'), '--out', 'OUT'], /stages\[0\] \(id "a", mixer\): kind: unknown stage kind "mixer"/);
  });
  it('a missing option is a usage error (exit 2)', async () => await expectFailure(['run', '--input', 'x'], /run: --chain is required/, 2));

  it('a failed run leaves an existing output directory as it was', async () => {
    const out = join(dir, 'keep');
    expect((await quadrille('run', '--chain', mixChain(), '--input', join(dir, 'tone.sigmf-meta'), '--out', out)).code).toBe(0);
    const before = readFileSync(join(out, 'results.json'), 'utf8');
    writeNanCapture();
    const r = await quadrille('run', '--chain', mixChain(), '--input', join(dir, 'nan.sigmf-meta'), '--out', out);
    expect(r.code).toBe(1);
    expect(readdirSync(out).sort()).toEqual(['output.sigmf-data', 'output.sigmf-meta', 'results.json']);
    expect(readFileSync(join(out, 'results.json'), 'utf8')).toBe(before);
  });
});

describe('spectral inversion in the output metadata', () => {
  it('I + jQ of a tone above the LO comes out mirrored and says so; I - jQ does not', async () => {
    // Real capture whose 0 Hz stands for 10 MHz RF; a tone at 150 kHz is RF 10.15 MHz. An LO at
    // 100 kHz moves RF 10.1 MHz to 0 Hz; I - jQ = x e^{-j w t} puts the tone at +50 kHz, I + jQ
    // at -50 kHz (common practice: the sign of Q sets the orientation).
    const n = 20_000;
    const real = new Float32Array(n);
    for (let k = 0; k < n; k++) real[k] = 0.5 * Math.cos(2 * Math.PI * ((k * 150_000 / FS) % 1));
    writeSigmf(join(dir, 'real-tone'), real, FS, {}, 'rf32_le', 10e6);
    const bin = FS / 1024;
    for (const [convention, inverted, peak] of [['i-minus-jq', false, 50_000], ['i-plus-jq', true, -50_000]] as const) {
      const out = join(dir, `qmix-${convention}`);
      // The follow-on mix moves the tone to 0 Hz: its RF (10.15 MHz) is then the output's core:frequency.
      const chain = writeChain(dir, `qmix-${convention}.json`, [
        { id: 'qm', kind: 'quadrature-mix', params: { loFrequency: 100_000, convention }, probe: true },
        { id: 'shift', kind: 'mix', params: { frequency: -peak } },
      ]);
      const r = await quadrille('run', '--chain', chain, '--input', join(dir, 'real-tone.sigmf-meta'), '--out', out);
      expect(r.code, r.stderr).toBe(0);
      const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
      const probe = results.probes.find((p: { stageId: string }) => p.stageId === 'qm');
      // The sum term (at -/+250 kHz) has the same level, so compare the tone with its mirror at -peak.
      const levelAt = (f: number) => {
        const freqs: number[] = probe.spectrum.frequencies;
        let best = 0;
        for (let k = 1; k < freqs.length; k++) if (Math.abs(freqs[k] - f) < Math.abs(freqs[best] - f)) best = k;
        expect(Math.abs(freqs[best] - f)).toBeLessThan(bin);
        return probe.spectrum.levels[best] as number;
      };
      expect(levelAt(peak) - levelAt(-peak)).toBeGreaterThan(60);
      const raw = JSON.parse(readFileSync(join(out, 'output.sigmf-meta'), 'utf8'));
      expect(raw.global['quadrille:spectrum_inverted']).toBe(inverted);
      expect(raw.global['core:extensions']).toEqual([{ name: 'quadrille', version: '1.0.0', optional: true }]);
      expect(raw.global['core:description']).toMatch(inverted ? /Spectrum inverted/ : /Spectrum upright/);
      expect(raw.captures[0]['core:frequency']).toBe(10.15e6);
    }
  });
});

describe('quadrille inspect and --help', () => {
  it('prints metadata and a quick readout', async () => {
    const r = await quadrille('inspect', join(dir, 'tone.sigmf-meta'), '--json');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report).toMatchObject({ datatype: 'cf32_le', layout: 'complex', sampleRate: FS, samples: 50_000, description: 'Saltmarsh test tone' });
    expect(report.duration).toBeCloseTo(0.05, 12);
    // A complex tone of amplitude 0.5 has power 0.25: 10 log10(0.25) = -6.02 dBFS (common practice).
    expect(report.rmsDbfs[0]).toBeCloseTo(-6.0206, 3);
    expect(report.peakDbfs[0]).toBeCloseTo(-6.0206, 3);
    expect(Math.abs(report.dcOffset[0])).toBeLessThan(1e-3);
    expect(Math.abs(report.strongestTone.frequency - TONE)).toBeLessThan(FS / 4096 / 2);
    const text = await quadrille('inspect', join(dir, 'tone.sigmf-meta'));
    const shown = Number(/strongest tone\s+(-?[\d.]+) Hz/.exec(text.stdout)?.[1]);
    expect(Math.abs(shown - TONE)).toBeLessThan(FS / 4096 / 2);
    expect(text.stdout).toMatch(/duration\s+0\.0500000 s/);
  });

  it('counts clipped samples per channel with the crest factor and warns', async () => {
    // Hand-made: 8 I/Q samples tiled 64 times. |I| >= 1 at 1.25, -1, -2 (3 per tile); |Q| >= 1 at
    // 1, -1.5 (2 per tile); 0.99 stays below full scale. Squared magnitudes per tile:
    // 1.5625 + 1.25 + 1 + 0.0625 + 0.9801 + 4 + 2.25 + 0 = 11.1051, peak^2 = 4.
    const pattern = [[1.25, 0], [0.5, 1], [-1, 0], [0.25, 0], [0.99, 0], [-2, 0], [0, -1.5], [0, 0]];
    const iq = new Float32Array(2 * 8 * 64);
    for (let t = 0; t < 64; t++) pattern.forEach(([i, q], k) => { iq[2 * (t * 8 + k)] = i; iq[2 * (t * 8 + k) + 1] = q; });
    writeSigmf(join(dir, 'clipped'), iq, FS);
    const r = await quadrille('inspect', join(dir, 'clipped.sigmf-meta'), '--json');
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.clipped).toEqual([192, 128]);
    expect(report.crestFactorDb[0]).toBeCloseTo(10 * Math.log10(4 / (11.1051 / 8)), 4);
    const text = (await quadrille('inspect', join(dir, 'clipped.sigmf-meta'))).stdout;
    expect(text).toMatch(/clipped I\s+192 of 512 samples at or beyond full scale, crest factor 4\.60 dB/);
    expect(text).toMatch(/clipped Q\s+128 of 512 samples/);
    expect(text).toMatch(/overload\s+WARNING/);
    // The clean tone: no clipped sample, no warning; crest factor 0 dB for a constant-magnitude tone.
    const clean = (await quadrille('inspect', join(dir, 'tone.sigmf-meta'))).stdout;
    expect(clean).toMatch(/clipped I\s+0 of 50000 samples/);
    expect(clean).not.toMatch(/overload/);
  });

  it('--help lists the commands', async () => {
    const r = await quadrille('--help');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/quadrille run --chain CHAIN\.json --input CAPTURE --out DIR/);
    expect(r.stdout).toMatch(/quadrille inspect CAPTURE/);
  });
});
