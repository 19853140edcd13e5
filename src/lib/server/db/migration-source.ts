/**
 * Migrations bundled into the built server, which has no TypeScript loader at run time.
 * Names are the file names, exactly as the knex CLI's directory source reports them, so the CLI
 * and the server share one history in knex_migrations.
 */
import type { Knex } from 'knex';

interface MigrationModule {
  up(db: Knex): Promise<void>;
  down(db: Knex): Promise<void>;
}

const modules = import.meta.glob<MigrationModule>('/migrations/*.ts', { eager: true });

/** Migration file name (e.g. `20261201090000_create_users.ts`) to its module, sorted by name. */
export const bundledMigrations: ReadonlyArray<readonly [string, MigrationModule]> = Object.entries(modules)
  .map(([path, module]) => [path.slice(path.lastIndexOf('/') + 1), module] as const)
  .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));

/** A Knex migration source over the bundled migrations. */
export const bundledMigrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return bundledMigrations.map(([name]) => name);
  },
  getMigrationName(name) {
    return name;
  },
  async getMigration(name) {
    const found = bundledMigrations.find(([candidate]) => candidate === name);
    if (!found) throw new Error(`Unknown migration ${name}`);
    return found[1];
  },
};

/** Applies every pending bundled migration; returns the names applied now. */
export async function migrateToLatest(db: Knex): Promise<string[]> {
  const [, applied] = (await db.migrate.latest({ migrationSource: bundledMigrationSource })) as [number, string[]];
  return applied;
}
