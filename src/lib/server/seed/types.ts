import type { Knex } from 'knex';

/** One part of the demo seed. Safe to run twice: it checks for its own data first. */
export interface SeedStep {
  name: string;
  /** Adds this step's data; answers whether it added anything. */
  run(db: Knex): Promise<boolean>;
}
