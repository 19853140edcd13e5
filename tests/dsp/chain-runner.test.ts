/** The chain runner: output, progress, cancel, errors naming the stage, probes. */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import type { StageDefinition, StreamFormat } from '@/dsp/types';
import { assertChainDocument, ChainRunError, ConstellationSampler, runChain, type RunProgress } from '@/dsp/chain/index';
import { mixStage, stageDefinitions } from '@/dsp/stages/index';
import { complexTone, concat, gaussianNoise, randomBlocks, realTone, runStage, sameBits } from './stages-helpers';

const fs = 1e6;
const complex: StreamFormat = { sampleRate: fs, sampleType: 'complex' };

function doc(stages: unknown[], registry = stageDefinitions) {
  return assertChainDocument({ version: 1, name: 'runner test', stages }, registry);
}

async function* asyncBlocks(blocks: Float32Array[]) {
  for (const block of blocks) {
    await Promise.resolve();
    yield block;
  }
}

describe('runChain output', () => {
  const input = gaussianNoise(2 * 20_000, 0.3, 5);
  const stages = [
    { id: 'dc', kind: 'dc-remove', params: { method: 'mean', estimateSamples: 3000 } },
    { id: 'shift', kind: 'mix', params: { frequency: 123_456.7 } },
    { id: 'g', kind: 'gain', params: { gainDb: -6 } },
    { id: 'cut', kind: 'trim', params: { start: 0.001, duration: 0.015 } },
  ];

  it('gives the same samples as the stages run one after the other, for any block split and an async source', async () => {
    let expected = runStage(stageDefinitions['dc-remove'], stages[0].params, complex, [input]);
    expected = runStage(mixStage, stages[1].params, complex, [expected]);
    expected = runStage(stageDefinitions.gain, stages[2].params, complex, [expected]);
    expected = runStage(stageDefinitions.trim, stages[3].params, complex, [expected]);
    expect(expected.length).toBe(2 * 15_000);

    const collected: Float32Array[] = [];
    const result = await runChain(doc(stages), complex, randomBlocks(input, 2, 2500, 9), {
      onOutput: (block, format) => {
        expect(format.sampleType).toBe('complex');
        collected.push(block.slice());
      },
    });
    expect(sameBits(concat(collected), expected)).toBe(true);
    expect(result.samplesIn).toBe(20_000);
    expect(result.samplesOut).toBe(15_000);
    expect(result.outputFormat).toEqual({ sampleRate: fs, sampleType: 'complex' });
    expect(result.probes).toEqual([]);

    const asyncCollected: Float32Array[] = [];
    await runChain(doc(stages), complex, asyncBlocks(randomBlocks(input, 2, 700, 10)), {
      onOutput: async (block) => {
        await Promise.resolve();
        asyncCollected.push(block.slice());
      },
    });
    expect(sameBits(concat(asyncCollected), expected)).toBe(true);
  });

  it('passes the input through bypassed stages and through an empty chain', async () => {
    const out: Float32Array[] = [];
    await runChain(doc([{ id: 'g', kind: 'gain', params: { gainDb: 20 }, bypass: true }]), complex, [input], { onOutput: (b) => void out.push(b.slice()) });
    expect(sameBits(concat(out), input)).toBe(true);
    const none: Float32Array[] = [];
    const result = await runChain(doc([]), complex, [input], { onOutput: (b) => void none.push(b.slice()) });
    expect(sameBits(concat(none), input)).toBe(true);
    expect(result.samplesOut).toBe(20_000);
  });

  it('changes the sample type along the chain (real-pair -> complex)', async () => {
    const pair = gaussianNoise(2 * 1000, 0.1, 3);
    const result = await runChain(doc([{ id: 'qc', kind: 'quadrature-combine' }]), { sampleRate: fs, sampleType: 'real-pair' }, [pair]);
    expect(result.outputFormat.sampleType).toBe('complex');
    expect(result.samplesOut).toBe(1000);
  });

  it('rejects a source block that is not whole samples, naming the block', async () => {
    await expect(runChain(doc([]), complex, [new Float32Array(4), new Float32Array(3)])).rejects.toThrow('source block 1: 3 values is not a whole number of complex samples');
  });

  it('lets errors of the source through unchanged', async () => {
    function* failing() {
      yield new Float32Array(4);
      throw new Error('data file: NaN at sample 2');
    }
    await expect(runChain(doc([{ id: 'g', kind: 'gain' }]), complex, failing())).rejects.toThrow('data file: NaN at sample 2');
  });
});

describe('runChain progress', () => {
  it('reports a non-decreasing fraction, the flush of a held-back stage, and 1 at the end', async () => {
    const input = gaussianNoise(2 * 10_000, 0.3, 6);
    const seen: RunProgress[] = [];
    await runChain(doc([{ id: 'dc', kind: 'dc-remove', params: { estimateSamples: 50_000 } }]), complex, randomBlocks(input, 2, 1000, 4), {
      totalSamples: 10_000,
      onProgress: (p) => seen.push({ ...p }),
    });
    const fractions = seen.map((p) => p.fraction);
    for (let k = 1; k < fractions.length; k++) expect(fractions[k]).toBeGreaterThanOrEqual(fractions[k - 1]);
    expect(seen.at(-1)).toEqual({ fraction: 1, samplesIn: 10_000 });
    expect(seen.some((p) => p.stageId === 'dc')).toBe(true);
    expect(seen.filter((p) => p.stageId === undefined).length).toBeGreaterThan(5);
  });
});

describe('runChain cancel', () => {
  it('throws an AbortError when cancelled between blocks', async () => {
    const controller = new AbortController();
    const blocks = Array.from({ length: 50 }, () => new Float32Array(2000));
    let calls = 0;
    const run = runChain(doc([{ id: 'shift', kind: 'mix', params: { frequency: 1000 } }]), complex, blocks, {
      signal: controller.signal,
      onProgress: () => {
        if (++calls === 3) controller.abort();
      },
    });
    await expect(run).rejects.toMatchObject({ name: 'AbortError' });
    expect(calls).toBe(3);
  });

  it('lets a timer cancel a long synchronous source (the runner yields to the event loop)', async () => {
    const controller = new AbortController();
    const block = new Float32Array(2 * 65_536);
    let produced = 0;
    function* endless() {
      for (;;) {
        produced++;
        // Queued as a macrotask from inside the synchronous source: it can only fire when the runner
        // gives the event loop a turn; if it never does, the run never ends and the test times out.
        if (produced === 3) setImmediate(() => controller.abort());
        yield block;
      }
    }
    await expect(runChain(doc([{ id: 'shift', kind: 'mix', params: { frequency: 1000 } }]), complex, endless(), { signal: controller.signal })).rejects.toMatchObject({
      name: 'AbortError',
    });
    expect(produced).toBeGreaterThanOrEqual(3);
  });

  it('refuses to start with a signal already aborted', async () => {
    const controller = new AbortController();
    controller.abort();
    await expect(runChain(doc([]), complex, [], { signal: controller.signal })).rejects.toMatchObject({ name: 'AbortError' });
  });
});

describe('ChainRunError', () => {
  const explode: StageDefinition<{ at: number }> = {
    kind: 'explode',
    title: 'x',
    summary: 'x',
    schema: z.object({ at: z.number() }).strict(),
    fields: {},
    accepts: ['complex'],
    propagate: (_p, input) => ({ output: { ...input }, issues: [] }),
    create: (p) => {
      let seen = 0;
      return {
        process(block) {
          seen += block.length / 2;
          if (seen > p.at) throw new RangeError('overflowed the accumulator');
          return block;
        },
        finish: () => new Float32Array(0),
      };
    },
  };
  const registry = { ...stageDefinitions, explode };

  it('names the stage, its kind and the first sample of the failing block', async () => {
    const chain = doc(
      [
        { id: 'g', kind: 'gain' },
        { id: 'boom', kind: 'explode', params: { at: 1000 } },
      ],
      registry,
    );
    const blocks = Array.from({ length: 10 }, () => new Float32Array(2 * 300));
    const error = await runChain(chain, complex, blocks, { registry }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(ChainRunError);
    const runError = error as ChainRunError;
    expect(runError).toMatchObject({ stageId: 'boom', kind: 'explode', sampleIndex: 900 });
    expect(runError.message).toBe('stages[1] (id "boom", explode): processing failed at input sample 900: overflowed the accumulator');
    expect(runError.cause).toBeInstanceOf(RangeError);
  });

  it('comes from a real stage: blind iq-correct on a stream whose I and Q are the same', async () => {
    const same = realTone(4000, 1000, fs);
    const iq = new Float32Array(8000);
    for (let n = 0; n < 4000; n++) iq[2 * n] = iq[2 * n + 1] = same[n];
    const chain = doc([{ id: 'iq', kind: 'iq-correct', params: { estimateSamples: 1500 } }]);
    const error = (await runChain(chain, complex, randomBlocks(iq, 2, 400, 1)).catch((e: unknown) => e)) as ChainRunError;
    expect(error).toBeInstanceOf(ChainRunError);
    expect(error.stageId).toBe('iq');
    expect(error.kind).toBe('iq-correct');
    expect(error.sampleIndex).toBeLessThanOrEqual(1500);
    expect(error.message).toMatch(/^stages\[0\] \(id "iq", iq-correct\): processing failed at input sample \d+: blind estimate found a phase error of 90\.0 deg/);
  });

  it('is thrown before any sample is read when the chain has errors', async () => {
    let read = false;
    function* source() {
      read = true;
      yield new Float32Array(2);
    }
    const chain = doc([{ id: 'iq', kind: 'iq-correct' }]);
    const error = (await runChain(chain, { sampleRate: fs, sampleType: 'real' }, source()).catch((e: unknown) => e)) as ChainRunError;
    expect(error).toBeInstanceOf(ChainRunError);
    expect(error).toMatchObject({ stageId: 'iq', kind: 'iq-correct', sampleIndex: 0 });
    expect(error.message).toBe('the chain cannot run: stages[0] (id "iq", iq-correct): needs complex input, but is fed real (turn a real stream into complex with quadrature-mix)');
    expect(error.issues[0].code).toBe('input-type-mismatch');
    expect(read).toBe(false);
  });
});

describe('probes', () => {
  it('a probed stream stage gets a Welch spectrum, a min/max trace and a constellation of its output', async () => {
    const input = complexTone(50_000, 100e3, fs, 0.5);
    const chain = doc([
      { id: 'shift', kind: 'mix', params: { frequency: 150e3 }, probe: true },
      { id: 'g', kind: 'gain', params: { gainDb: 6 } },
    ]);
    const result = await runChain(chain, complex, randomBlocks(input, 2, 5000, 2));
    expect(result.probes).toHaveLength(1);
    const [probe] = result.probes;
    expect(probe.stageId).toBe('shift');
    expect(probe.kind).toBe('mix');
    expect(probe.format).toEqual({ sampleRate: fs, sampleType: 'complex' });
    // The tone moved from 100 kHz to 250 kHz; its level: A^2 / (fs * ENBW factor) in dBFS/Hz, i.e.
    // power 0.25 spread over the Hann window's noise bandwidth (1.5 bins, Harris 1978, Table 1).
    expect(probe.spectrum!.peak.frequency).toBeCloseTo(250e3, -2);
    expect(probe.spectrum!.unit).toBe('dBFS/Hz');
    const binWidth = fs / 2048;
    expect(probe.spectrum!.peak.level).toBeCloseTo(10 * Math.log10(0.25 / (1.5 * binWidth)), 0);
    expect(probe.trace!.channels).toHaveLength(2);
    expect(Math.max(...probe.trace!.channels[0].max)).toBeCloseTo(0.5, 3);
    expect(probe.constellation!.length).toBeGreaterThan(1000);
    expect(probe.constellation!.length).toBeLessThanOrEqual(2 * 2048);
    for (let k = 0; k < probe.constellation!.length; k += 2) {
      expect(Math.hypot(probe.constellation![k], probe.constellation![k + 1])).toBeCloseTo(0.5, 5);
    }
  });

  it('a probed real stream has a one-sided spectrum and no constellation; two channels only a trace', async () => {
    const real = await runChain(doc([{ id: 'g', kind: 'gain', probe: true }]), { sampleRate: fs, sampleType: 'real' }, [realTone(8192, 125e3, fs)]);
    expect(real.probes[0].spectrum!.frequencies[0]).toBe(0);
    expect(real.probes[0].spectrum!.peak.frequency).toBeCloseTo(125e3, -2);
    expect(real.probes[0].constellation).toBeUndefined();
    const pair = await runChain(doc([{ id: 'g', kind: 'gain', probe: true }]), { sampleRate: fs, sampleType: 'real-pair' }, [gaussianNoise(2000, 0.1, 1)]);
    expect(pair.probes[0].spectrum).toBeUndefined();
    expect(pair.probes[0].trace!.channels).toHaveLength(2);
  });

  it('a probe on a bypassed stage shows its (unchanged) input; probes come in chain order', async () => {
    const result = await runChain(
      doc([
        { id: 'a', kind: 'gain', probe: true },
        { id: 'b', kind: 'mix', params: { frequency: 1000 }, probe: true, bypass: true },
      ]),
      complex,
      [complexTone(4096, 0, fs, 0.25)],
    );
    expect(result.probes.map((p) => p.stageId)).toEqual(['a', 'b']);
    expect(result.probes[1].spectrum!.peak.frequency).toBeCloseTo(0, -2);
  });
});

describe('ConstellationSampler', () => {
  it('keeps at most its capacity, evenly spread, whatever the block sizes', () => {
    const data = new Float32Array(2 * 10_000).map((_, i) => Math.floor(i / 2));
    const whole = new ConstellationSampler(100);
    whole.push(data);
    const points = whole.result();
    expect(points.length).toBeLessThanOrEqual(200);
    expect(points.length).toBeGreaterThan(100);
    const indices = points.filter((_, k) => k % 2 === 0);
    const stride = indices[1] - indices[0];
    expect(indices.every((v, k) => v === k * stride)).toBe(true);
    const split = new ConstellationSampler(100);
    for (const block of randomBlocks(data, 2, 333, 8)) split.push(block);
    expect(split.result()).toEqual(points);
  });
});

describe('default probe levels', () => {
  it('complex white noise of variance s^2 reads s^2 / fs as density (scipy.signal.welch documentation, SciPy 1.17)', async () => {
    const sigma = 0.1; // per component: total variance 2 sigma^2
    const result = await runChain(doc([{ id: 'g', kind: 'gain', probe: true }]), complex, [gaussianNoise(2 * 400_000, sigma, 12)]);
    const levels = result.probes[0].spectrum!.levels;
    const meanDensity = levels.reduce((s, l) => s + Math.pow(10, l / 10), 0) / levels.length;
    expect(10 * Math.log10(meanDensity)).toBeCloseTo(10 * Math.log10((2 * sigma * sigma) / fs), 1);
  });
});
