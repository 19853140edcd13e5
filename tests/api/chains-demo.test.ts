/**
 * The seeded demo chains do their job on the demo captures: run on the synthesized rev A beacon
 * capture, the down-conversion finds the beacon's power at 0 Hz and the balance check reads the
 * front end's impairments. (The estimators themselves are checked against published references in
 * tests/dsp; this checks that the demo chains are composed to use them correctly.)
 */
import { describe, expect, it } from 'vitest';
import { assertChainDocument, runChain } from '@/dsp/chain';
import { demoSynthSpecs, synthesize } from '@/dsp/synth';
import type { Readout } from '@/dsp/types';
import { demoChains } from '@/lib/server/seed/chains';

const revA = demoSynthSpecs.find((capture) => capture.slug === 'saltmarsh-rev-a-beacon')!.spec;
const samples = synthesize(revA);

async function readoutsOf(chainName: string): Promise<Map<string, number | null>> {
  const chain = demoChains.find((candidate) => candidate.name === chainName)!;
  const result = await runChain(assertChainDocument(chain.document), { sampleRate: 4e6, sampleType: 'complex' }, [samples]);
  expect(result.issues).toEqual([]);
  const readouts: Readout[] = result.probes.flatMap((probe) => probe.readouts ?? []);
  return new Map(readouts.map((readout) => [readout.name, readout.value]));
}

describe('demo chains on the rev A beacon capture', () => {
  it('Beacon down-conversion holds the whole beacon power in its channel at 0 Hz', async () => {
    expect(revA.sampleRate).toBe(4e6);
    const readouts = await readoutsOf('Beacon down-conversion');
    // The demo spec sets the beacon carrier to -12 dBFS; the interferer and noise lie far below it.
    expect(readouts.get('Channel power')).toBeCloseTo(-12, 0);
    // A root-raised-cosine signal occupies at most Rs x (1 + roll-off) = 337.5 kHz (Proakis, Digital
    // Communications, 4th ed., sec. 9.2); its 99 % bandwidth lies inside that and is centred on 0 Hz.
    const obw = readouts.get('Occupied bandwidth (99 %)')!;
    expect(obw).toBeGreaterThan(250e3);
    expect(obw).toBeLessThan(337.5e3);
    expect(Math.abs(readouts.get('Occupied band lower edge')! + readouts.get('Occupied band upper edge')!)).toBeLessThan(10e3);
    // The DC offset was removed before the mix, so no LO leakage reaches 0 Hz.
    expect(readouts.get('DC level')!).toBeLessThan(-60);
  });

  it('Front-end balance check reads the rev A impairments of the demo scenario', async () => {
    const readouts = await readoutsOf('Front-end balance check');
    // Rev A of the invented scenario: about 0.3 dB gain and 2 degrees phase imbalance, DC offset 0.018 / -0.011 FS.
    expect(readouts.get('I/Q gain imbalance (I relative to Q)')).toBeCloseTo(0.3, 1);
    expect(readouts.get('I/Q phase imbalance')).toBeCloseTo(2, 1);
    expect(readouts.get('DC offset I')).toBeCloseTo(0.018, 3);
    expect(readouts.get('DC offset Q')).toBeCloseTo(-0.011, 3);
    expect(readouts.has('Image rejection')).toBe(true);
    expect(readouts.has('Tone frequency')).toBe(true);
  });
});
