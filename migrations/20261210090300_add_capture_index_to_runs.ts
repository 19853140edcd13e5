import type { Knex } from 'knex';

// The runs of one capture, newest first (the list's capture filter). The id is the list's tie-break:
// with it the index gives the whole ORDER BY, without it SQLite sorts each page in a temp b-tree.
export async function up(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.index(['capture_id', 'created_at', 'id'], 'runs_capture_id_created_at_index');
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.dropIndex(['capture_id', 'created_at', 'id'], 'runs_capture_id_created_at_index');
  });
}
