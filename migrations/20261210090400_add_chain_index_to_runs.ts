import type { Knex } from 'knex';

// The runs of one chain, newest first (the list's chain filter). The id is the list's tie-break:
// with it the index gives the whole ORDER BY, without it SQLite sorts each page in a temp b-tree.
export async function up(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.index(['chain_id', 'created_at', 'id'], 'runs_chain_id_created_at_index');
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.dropIndex(['chain_id', 'created_at', 'id'], 'runs_chain_id_created_at_index');
  });
}
