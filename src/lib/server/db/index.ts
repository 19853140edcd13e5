/**
 * The server's one Knex instance, opened lazily so importing a module never touches the disk.
 */
import knex, { type Knex } from 'knex';
import { knexConfig } from './config';

let instance: Knex | null = null;

/** The shared database handle of this process. */
export function getDb(): Knex {
  instance ??= knex(knexConfig());
  return instance;
}

/** Opens a separate handle on the database in `folder` (seeding, tests, scripts). */
export function openDb(folder?: string): Knex {
  return knex(knexConfig(folder));
}
