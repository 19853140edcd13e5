/**
 * Whole chains through the default registry, with the filter, decimate and spectrum kinds: the
 * reference down-conversion, the quadrature sign convention after low-pass filtering, and block-size
 * invariance of a whole chain.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { StreamFormat } from '@/dsp/types';
import { assertChainDocument, propagateChain, propagationIssues, runChain } from '@/dsp/chain/index';
import { listStageKinds } from '@/dsp/stages/index';
import { complexTone, concat, gaussianNoise, randomBlocks, realTone, sameBits } from './stages-helpers';

describe('default registry', () => {
  it('holds every stage kind of the product, each with a title and a summary', () => {
    const kinds = listStageKinds();
    expect(kinds.map((k) => k.kind).sort()).toEqual(
      ['dc-remove', 'decimate', 'filter', 'gain', 'iq-correct', 'measure', 'mix', 'quadrature-combine', 'quadrature-mix', 'spectrogram', 'spectrum', 'trim'].sort(),
    );
    for (const k of kinds) {
      expect(k.title.length).toBeGreaterThan(2);
      expect(k.summary.length).toBeGreaterThan(10);
    }
  });
});

describe('reference down-conversion chain', () => {
  const fs = 10e6;
  const format: StreamFormat = { sampleRate: fs, sampleType: 'complex' };
  const doc = assertChainDocument(JSON.parse(readFileSync(new URL('../bench/reference-ddc.chain.json', import.meta.url), 'utf8')));

  it('propagates without warnings to 1.25 Msps', () => {
    const result = propagateChain(doc, format);
    expect(propagationIssues(result)).toEqual([]);
    expect(result.at(-1)!.output.sampleRate).toBe(1.25e6);
  });

  it('finds a tone 1.25 MHz + 100 kHz above 0 Hz at +100 kHz after mixing, filtering and decimating', async () => {
    // 100 kHz falls between bins (bin width 1.25 MHz / 4096 = 305.2 Hz): allow one bin of frequency
    // error and the Hann scalloping loss (1.42 dB, Harris 1978, Table 1) below the expected level.
    const n = 1 << 19;
    const tone = complexTone(n, 1.35e6, fs, 0.5);
    const noise = gaussianNoise(2 * n, 1e-3, 4);
    for (let v = 0; v < tone.length; v++) tone[v] += noise[v];
    const result = await runChain(doc, format, randomBlocks(tone, 2, 65_536, 3));
    const psd = result.probes.find((p) => p.stageId === 'psd')!;
    expect(psd.kind).toBe('spectrum');
    expect(psd.format.sampleRate).toBe(1.25e6);
    const binWidth = 1.25e6 / 4096;
    expect(Math.abs(psd.spectrum!.peak.frequency - 100e3)).toBeLessThan(binWidth);
    // Tone power 0.25 over the Hann noise bandwidth of 1.5 bins (Harris 1978, Table 1), in dBFS/Hz.
    const expected = 10 * Math.log10(0.25 / (1.5 * binWidth));
    expect(psd.spectrum!.peak.level).toBeGreaterThan(expected - 1.5);
    expect(psd.spectrum!.peak.level).toBeLessThan(expected + 0.2);
    expect(result.samplesOut).toBe(n / 8);
  });
});

describe('quadrature sign convention through a filtered chain', () => {
  // Common practice (CHECKS.md, facts of the trade): mixing a real tone at f_LO + f_IF with cos for I
  // and sin for Q, low-pass filtering both and forming I - jQ leaves one tone at +f_IF; I + jQ at -f_IF.
  const fs = 40e6;
  const fLo = 10.7e6;
  const fIf = 200e3;
  const format: StreamFormat = { sampleRate: fs, sampleType: 'real' };
  const capture = realTone(1 << 17, fLo + fIf, fs, 0.8);

  async function peakAfter(convention: string) {
    const doc = assertChainDocument({
      version: 1,
      stages: [
        { id: 'qm', kind: 'quadrature-mix', params: { loFrequency: fLo, convention } },
        { id: 'lp', kind: 'filter', params: { design: 'kaiser', cutoff: 1e6, transition: 1e6, attenuation: 80 } },
        { id: 'dec', kind: 'decimate', params: { factor: 10, antiAlias: false } },
        { id: 'psd', kind: 'spectrum', params: { fftSize: 4096, scaling: 'spectrum' } },
      ],
    });
    expect(propagationIssues(propagateChain(doc, format))).toEqual([]);
    const result = await runChain(doc, format, [capture]);
    return result.probes[0].spectrum!;
  }

  it("'i-minus-jq' puts the tone at +f_IF with amplitude half the real tone's", async () => {
    const spectrum = await peakAfter('i-minus-jq');
    expect(Math.abs(spectrum.peak.frequency - fIf)).toBeLessThan(1e3);
    // x e^{-j w_LO t} keeps half the real amplitude: 0.4, i.e. 20 log10(0.4) dBFS with spectrum
    // scaling (scipy.signal.welch documentation: a complex tone of amplitude A peaks at A^2), within
    // the Hann scalloping loss (1.42 dB, Harris 1978).
    expect(spectrum.peak.level).toBeGreaterThan(20 * Math.log10(0.4) - 1.5);
    expect(spectrum.peak.level).toBeLessThan(20 * Math.log10(0.4) + 0.1);
    const imageBin = spectrum.frequencies.findIndex((f) => f >= -fIf);
    expect(spectrum.levels[imageBin]).toBeLessThan(spectrum.peak.level - 60);
  });

  it("'i-plus-jq' puts it at -f_IF", async () => {
    const spectrum = await peakAfter('i-plus-jq');
    expect(Math.abs(spectrum.peak.frequency + fIf)).toBeLessThan(1e3);
  });
});

describe('a whole chain is block-size invariant', () => {
  it('mix, filter, decimate, iq-correct and gain give the same samples for any block split', async () => {
    const format: StreamFormat = { sampleRate: 4e6, sampleType: 'complex' };
    const doc = assertChainDocument({
      version: 1,
      stages: [
        { id: 'dc', kind: 'dc-remove', params: { method: 'blocker' } },
        { id: 'shift', kind: 'mix', params: { frequency: -600e3 } },
        { id: 'lp', kind: 'filter', params: { design: 'window', cutoff: 300e3, taps: 63 } },
        { id: 'dec', kind: 'decimate', params: { factor: 4, antiAlias: false } },
        { id: 'iq', kind: 'iq-correct', params: { estimateSamples: 2000 } },
        { id: 'g', kind: 'gain', params: { mode: 'rms', targetDb: -12, estimateSamples: 3000 } },
      ],
    });
    const input = gaussianNoise(2 * 60_000, 0.2, 21);
    const collect = async (blocks: Float32Array[]) => {
      const out: Float32Array[] = [];
      await runChain(doc, format, blocks, { onOutput: (b) => void out.push(b.slice()) });
      return concat(out);
    };
    const whole = await collect([input]);
    expect(whole.length).toBe(2 * 15_000);
    expect(sameBits(await collect(randomBlocks(input, 2, 3000, 1)), whole)).toBe(true);
    expect(sameBits(await collect(randomBlocks(input, 2, 7, 2)), whole)).toBe(true);
  });
});
