/**
 * Demo accounts of the invented Saltmarsh Telemetry team, one per role, for local demos only.
 */
import type { Knex } from 'knex';
import type { Role } from '@/lib/permissions';
import { countUsers, createUser } from '../users';
import type { SeedStep } from './types';

/** The shared password of every demo account (local demo only). */
export const demoPassword = 'quadrille-demo';

/** The demo accounts, admin first so it is the installation's first account. */
export const demoAccounts: ReadonlyArray<{ email: string; name: string; role: Role }> = [
  { email: 'admin@saltmarsh.test', name: 'Maren Okafor', role: 'admin' },
  { email: 'engineer@saltmarsh.test', name: 'Teodor Lindqvist', role: 'engineer' },
  { email: 'operator@saltmarsh.test', name: 'Priya Halloran', role: 'operator' },
];

/** Creates the demo accounts, only on a database without accounts. */
export const seedDemoAccounts: SeedStep = {
  name: 'demo accounts',
  async run(db: Knex) {
    if ((await countUsers(db)) > 0) return false;
    for (const account of demoAccounts) await createUser(db, { ...account, password: demoPassword });
    return true;
  },
};
