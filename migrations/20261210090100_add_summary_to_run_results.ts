import type { Knex } from 'knex';

// The summary a run page reads first (readouts, issues, timing, test points and their plot kinds),
// JSON text computed by the worker. Null for results filed before it existed until the server
// fills it in at start.
export async function up(db: Knex): Promise<void> {
  await db.schema.alterTable('run_results', (table) => {
    table.text('summary').nullable();
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.alterTable('run_results', (table) => {
    table.dropColumn('summary');
  });
}
