import type { Knex } from 'knex';

// Each probe's data of a cached result, one row per probe (stage id) and plot kind: the full data
// and a preview already reduced for the screen, both JSON text, so a plot request reads one small
// row instead of the whole results document. Written in the transaction that files the result.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('run_probe_data', (table) => {
    table.string('result_id', 36).notNullable().references('id').inTable('run_results').onDelete('CASCADE');
    table.string('stage_id', 64).notNullable();
    table.string('kind', 16).notNullable();
    table.text('data').notNullable();
    table.text('preview').notNullable();
    table.primary(['result_id', 'stage_id', 'kind']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('run_probe_data');
}
