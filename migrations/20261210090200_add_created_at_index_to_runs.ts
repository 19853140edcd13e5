import type { Knex } from 'knex';

// The runs list (newest first, id as tie-break) pages by keyset over this index.
export async function up(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.index(['created_at', 'id'], 'runs_created_at_id_index');
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.alterTable('runs', (table) => {
    table.dropIndex(['created_at', 'id'], 'runs_created_at_id_index');
  });
}
