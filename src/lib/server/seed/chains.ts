/**
 * The two demo chains of the Saltmarsh Telemetry scenario, owned by the demo engineer and shared
 * with the team. Both are made for the demo beacon captures (complex I/Q at 4 Msps, QPSK beacon
 * at +600 kHz, 250 ksym/s with roll-off 0.35, CW interferer at -1.35 MHz; src/dsp/synth/demo.ts).
 */
import type { Knex } from 'knex';
import { createChain } from '../chains/create';
import { findUserByEmail } from '../users';
import type { SeedStep } from './types';

/** Owner of the demo chains. */
export const demoChainOwnerEmail = 'engineer@saltmarsh.test';

/** Offset of the node beacon from the LO (Hz), as the demo captures place it. */
const BEACON_OFFSET = 600e3;
/** Half the beacon's occupied bandwidth (Hz): 250 ksym/s x (1 + 0.35) / 2. */
const BEACON_HALF_BANDWIDTH = (250e3 * 1.35) / 2;

export interface DemoChain {
  name: string;
  description: string;
  document: Record<string, unknown>;
}

const beaconDescription =
  'Brings the rev A/B node beacon from +600 kHz to 0 Hz and down to 500 ksps: DC removed and I/Q balance corrected blindly ' +
  'first (so the LO leakage and the image do not follow the beacon down), Kaiser low-pass at 200 kHz whose stop band ends ' +
  'at 240 kHz, below the 250 kHz Nyquist frequency after decimating by 8. Probes: baseband spectrum, channel power and ' +
  '99 % occupied bandwidth of the beacon.';

const balanceDescription =
  'Reads the front-end impairments of a complex capture as recorded: spectrum of the whole band, DC offset, blind I/Q ' +
  'gain and phase imbalance with the image rejection they imply, and the strongest tone. Rerun it on each board ' +
  'revision and compare.';

/** The demo chains as chain documents (format version 1). */
export const demoChains: readonly DemoChain[] = [
  {
    name: 'Beacon down-conversion',
    description: beaconDescription,
    document: {
      version: 1,
      name: 'Beacon down-conversion',
      description: beaconDescription,
      stages: [
        { id: 'dc', kind: 'dc-remove', params: { method: 'mean' } },
        { id: 'iq', kind: 'iq-correct', params: { mode: 'blind' } },
        { id: 'to-baseband', kind: 'mix', params: { frequency: -BEACON_OFFSET, phase: 0 } },
        {
          id: 'channel',
          kind: 'filter',
          params: { design: 'kaiser', response: 'lowpass', cutoff: 200e3, transition: 80e3, attenuation: 60 },
        },
        { id: 'decimate', kind: 'decimate', params: { factor: 8, antiAlias: false } },
        { id: 'baseband-spectrum', kind: 'spectrum', params: { window: 'hann', fftSize: 2048, overlap: 0.5, scaling: 'density' }, probe: true },
        {
          id: 'beacon-readouts',
          kind: 'measure',
          params: { measurements: ['channel-power', 'obw', 'dc'], bandLow: -BEACON_HALF_BANDWIDTH, bandHigh: BEACON_HALF_BANDWIDTH },
          probe: true,
        },
      ],
    },
  },
  {
    name: 'Front-end balance check',
    description: balanceDescription,
    document: {
      version: 1,
      name: 'Front-end balance check',
      description: balanceDescription,
      stages: [
        { id: 'band-spectrum', kind: 'spectrum', params: { window: 'blackman-harris', fftSize: 8192, overlap: 0.5, scaling: 'density' }, probe: true },
        { id: 'balance', kind: 'measure', params: { measurements: ['dc', 'iq-imbalance', 'tone'], window: 'blackman-harris' }, probe: true },
      ],
    },
  },
];

/** Creates the demo chains that are missing (matched by owner and name), as team chains of the demo engineer. */
export const seedDemoChains: SeedStep = {
  name: 'demo chains',
  async run(db: Knex) {
    const owner = await findUserByEmail(db, demoChainOwnerEmail);
    if (!owner) return false;
    let added = false;
    for (const demo of demoChains) {
      if (await db('chains').where({ owner_id: owner.id, name: demo.name }).first('id')) continue;
      await createChain(db, {
        ownerId: owner.id,
        name: demo.name,
        description: demo.description,
        visibility: 'team',
        document: demo.document,
        message: 'Demo chain',
      });
      added = true;
    }
    return added;
  },
};
