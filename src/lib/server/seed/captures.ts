/**
 * Demo captures of the Saltmarsh Telemetry scenario: the synthesizer's four demo specs, owned by
 * the demo engineer and visible to the team, made through the same command as POST /api/synth,
 * with SigMF annotations on the beacon and the interferer.
 * Runs only while the database holds no capture at all. QUADRILLE_DEMO_CAPTURES=0 skips it
 * (a few seconds of synthesis that tests which do not look at captures can spare).
 */
import type { Knex } from 'knex';
import { demoSynthSpecs } from '@/dsp/synth';
import { demoCapturesEnabled } from '../config';
import { checkAnnotations, createSynthesizedCapture, DuplicateCaptureError, objectStoreForDatabase } from '../captures';
import { findUserByEmail } from '../users';
import type { SeedStep } from './types';

/** The demo account that owns the demo captures. */
export const demoCaptureOwnerEmail = 'engineer@saltmarsh.test';

export const seedDemoCaptures: SeedStep = {
  name: 'demo captures',
  async run(db: Knex) {
    if (!demoCapturesEnabled()) return false;
    const owner = await findUserByEmail(db, demoCaptureOwnerEmail);
    if (!owner) return false;
    const existing = await db('captures').count<{ count: number }[]>({ count: '*' }).first();
    if (Number(existing?.count ?? 0) > 0) return false;
    const store = objectStoreForDatabase(db);
    for (const demo of demoSynthSpecs) {
      try {
        const capture = await createSynthesizedCapture(db, store, owner, {
          name: demo.name,
          visibility: 'team',
          notes: demo.description,
          tags: demo.tags,
          spec: demo.spec,
        });
        // Checked like an owner's edit, so a wrong demo annotation fails the seed loudly.
        await db('captures').where({ id: capture.id }).update({ annotations: JSON.stringify(checkAnnotations(demo.annotations, capture)) });
      } catch (error) {
        // Same bytes already stored (an earlier run stopped half-way): keep that one.
        if (!(error instanceof DuplicateCaptureError)) throw error;
      }
    }
    return true;
  },
};
