import { describe, expect, test } from 'vitest';
import { spectrumStage } from '@/dsp/stages/spectrum';
import { spectrogramStage } from '@/dsp/stages/spectrogram';
import { measureStage } from '@/dsp/stages/measure';
import { getStageDefinition } from '@/dsp/stages';
import { runChain } from '@/dsp/chain/runner';
import { assertChainDocument } from '@/dsp/chain/parse';
import { WelchAccumulator } from '@/dsp/spectral';
import type { StageDefinition, StageProcessor, StreamFormat } from '@/dsp/types';
import { gaussian, randomBlocks, seededRandom } from './spectral-fixtures';

const complexFormat: StreamFormat = { sampleRate: 4e6, sampleType: 'complex' };

/** A Rev-A-like capture: tone at +600 kHz, 0.3 dB / 2 deg imbalance, DC offset, white noise. */
function unbalancedCapture(n: number, seed = 1): Float32Array {
  const normal = gaussian(seededRandom(seed));
  const g = 10 ** (0.3 / 20);
  const p = (2 * Math.PI) / 180;
  const x = new Float32Array(2 * n);
  for (let k = 0; k < n; k++) {
    const wt = (2 * Math.PI * 600e3 * k) / 4e6;
    x[2 * k] = 0.4 * g * Math.cos(wt) + 0.015 + 1e-3 * normal();
    x[2 * k + 1] = 0.4 * Math.sin(wt + p) - 0.008 + 1e-3 * normal();
  }
  return x;
}

function runBlocks(processor: StageProcessor, blocks: Float32Array[]): Float32Array[] {
  const out = blocks.map((b) => processor.process(b));
  processor.finish();
  return out;
}

describe('analysis stages', () => {
  test('registered under their kinds', () => {
    expect(getStageDefinition('spectrum')).toBe(spectrumStage);
    expect(getStageDefinition('spectrogram')).toBe(spectrogramStage);
    expect(getStageDefinition('measure')).toBe(measureStage);
  });

  test('defaults and parameter errors', () => {
    expect(spectrumStage.schema.parse({})).toMatchObject({ window: 'hann', fftSize: 4096, overlap: 0.5, averaging: 'mean', scaling: 'density', calibrationDb: 0 });
    expect(spectrogramStage.schema.parse({})).toMatchObject({ fftSize: 1024, maxRows: 256 });
    expect(measureStage.schema.parse({})).toMatchObject({ window: 'blackman-harris', fftSize: 8192 });
    const bad = spectrumStage.schema.safeParse({ fftSize: 1000 });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0].path).toEqual(['fftSize']);
    expect(bad.error?.issues[0].message).toMatch(/power of two/);
    const band = measureStage.schema.safeParse({ measurements: ['channel-power'], bandLow: 5 });
    expect(band.error?.issues.map((i) => i.path[0])).toEqual(['bandHigh']);
    expect(spectrumStage.schema.safeParse({ overlap: 0.99 }).success).toBe(false);
    expect(spectrumStage.schema.safeParse({ colour: 'red' }).success).toBe(false);
  });

  test('spectrum passes samples through and records the Welch estimate, for any block split', () => {
    const x = unbalancedCapture(100_000);
    const params = spectrumStage.schema.parse({ fftSize: 2048, window: 'blackman-harris', calibrationDb: -12 });
    const processor = spectrumStage.create(params, complexFormat);
    const blocks = randomBlocks(x, 2, 3, 9000);
    const outputs = runBlocks(processor, blocks);
    outputs.forEach((o, i) => expect(o).toEqual(blocks[i]));
    const probe = processor.probe!();
    const direct = new WelchAccumulator({ sampleRate: 4e6, sampleType: 'complex', fftSize: 2048, window: 'blackman-harris' });
    direct.push(x);
    expect(probe.spectrum).toEqual(direct.result(-12));
    expect(probe.spectrum!.unit).toBe('dBm/Hz');
    expect(probe.spectrum!.peak.frequency).toBeCloseTo(600e3, -2);
  });

  test('spectrogram stays within maxRows and matches for any block split', () => {
    const x = unbalancedCapture(60_000);
    const params = spectrogramStage.schema.parse({ fftSize: 256, maxRows: 16 });
    const a = spectrogramStage.create(params, complexFormat);
    runBlocks(a, [x]);
    const b = spectrogramStage.create(params, complexFormat);
    runBlocks(b, randomBlocks(x, 2, 8, 5000));
    const ra = a.probe!().spectrogram!;
    expect(ra.levels.length).toBeLessThanOrEqual(16);
    expect(ra.frequencies).toHaveLength(256);
    expect(b.probe!().spectrogram).toEqual(ra);
  });

  test('measure reads DC, imbalance and the tone of an unbalanced capture', () => {
    const x = unbalancedCapture(1 << 17);
    const params = measureStage.schema.parse({ measurements: ['tone', 'snr', 'sfdr', 'dc', 'iq-imbalance', 'obw', 'channel-power'], bandLow: 550e3, bandHigh: 650e3 });
    const processor = measureStage.create(params, complexFormat);
    runBlocks(processor, randomBlocks(x, 2, 12, 20_000));
    const readouts = Object.fromEntries(processor.probe!().readouts!.map((r) => [r.name, r]));
    // Every readout asked for is computable here; a null would carry its reason.
    const value = (name: string): number => {
      expect(readouts[name].value, readouts[name].reason).not.toBeNull();
      return readouts[name].value!;
    };
    expect(value('Tone frequency')).toBeCloseTo(600e3, 0);
    expect(value('DC offset I')).toBeCloseTo(0.015, 4);
    expect(value('DC offset Q')).toBeCloseTo(-0.008, 4);
    expect(value('I/Q gain imbalance (I relative to Q)')).toBeCloseTo(0.3, 2);
    expect(value('I/Q phase imbalance')).toBeCloseTo(2, 1);
    // The exact IRR of a gain ratio g and phase error phi (Razavi, RF Microelectronics, 2nd ed.,
    // 2012, eq. 4.62): IRR = (1 + 2 g cos(phi) + g^2) / (1 - 2 g cos(phi) + g^2), written out here
    // rather than calling the engine's imageRejectionDb, fed the readout's own imbalance estimates.
    const g = 10 ** (value('I/Q gain imbalance (I relative to Q)') / 20);
    const phi = (value('I/Q phase imbalance') * Math.PI) / 180;
    const irrDb = 10 * Math.log10((1 + 2 * g * Math.cos(phi) + g * g) / (1 - 2 * g * Math.cos(phi) + g * g));
    expect(value('Image rejection')).toBeCloseTo(irrDb, 9);
    // For the capture's own 0.3 dB / 2 degrees: g = 1.0351, phi = 0.0349 rad, so IRR = 32.2 dB by hand.
    expect(value('Image rejection')).toBeCloseTo(32.2, 0);
    // The strongest spur is the image at -600 kHz, at the image rejection below the tone
    // (common practice), within the Blackman-Harris scalloping loss of 0.83 dB (Harris 1978, Table 1).
    expect(Math.abs(value('SFDR') - value('Image rejection'))).toBeLessThan(0.83);
    expect(readouts['Tone level'].unit).toBe('dBFS');
    // The tone (power 0.16 x (1 + 2g cos p + g^2)/4) dominates the 100 kHz band.
    expect(value('Channel power')).toBeCloseTo(value('Tone level'), 1);
    // Over 99 % of the power is the tone, so the occupied band is its window main lobe, about
    // +/-4 bins of 488 Hz around 600 kHz (Blackman-Harris, Harris 1978).
    expect(value('Occupied bandwidth (99 %)')).toBeLessThan(8 * 488.3);
    expect((value('Occupied band lower edge') + value('Occupied band upper edge')) / 2).toBeCloseTo(600e3, -2);
  });

  test('measure warns about iq-imbalance on a real stream', () => {
    const params = measureStage.schema.parse({ measurements: ['iq-imbalance', 'dc'] });
    const { issues } = measureStage.propagate(params, { sampleRate: 1e6, sampleType: 'real' });
    expect(issues[0]).toMatchObject({ severity: 'warning', field: 'measurements' });
  });

  test('analysis stages run inside a chain and report probes', async () => {
    const registry: Record<string, StageDefinition<any>> = { spectrum: spectrumStage, measure: measureStage, spectrogram: spectrogramStage };
    const doc = assertChainDocument(
      {
        version: 1,
        name: 'Balance check',
        stages: [
          { id: 'psd', kind: 'spectrum', params: { fftSize: 1024 } },
          { id: 'img', kind: 'spectrogram', params: { fftSize: 256, maxRows: 8 } },
          { id: 'bal', kind: 'measure', params: { measurements: ['dc', 'iq-imbalance'] } },
        ],
      },
      registry,
    );
    const x = unbalancedCapture(50_000);
    const result = await runChain(doc, complexFormat, randomBlocks(x, 2, 2, 8000), { registry });
    expect(result.probes.map((p) => p.stageId)).toEqual(['psd', 'img', 'bal']);
    expect(result.samplesOut).toBe(50_000);
    expect(result.probes[2].readouts!.find((r) => r.name === 'I/Q gain imbalance (I relative to Q)')!.value).toBeCloseTo(0.3, 2);
  });
});
