import type { Knex } from 'knex';

// Stored captures: one row per sample file in the object store. Tags and SigMF annotations are
// JSON text (SQLite's json_each filters on tags); sizes are bigints because captures pass 4 GiB.
// (owner_id, sha256) is unique so two concurrent uploads of the same bytes by one user cannot
// both become captures: the second insert fails and is answered as a duplicate.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('captures', (table) => {
    table.string('id', 36).primary();
    table.string('owner_id', 36).notNullable().references('id').inTable('users').onDelete('RESTRICT');
    table.string('name', 200).notNullable();
    table.string('visibility', 8).notNullable();
    table.double('sample_rate').notNullable();
    table.double('center_frequency').nullable();
    table.string('datatype', 16).notNullable();
    table.string('layout', 16).notNullable();
    table.bigInteger('sample_count').notNullable();
    table.bigInteger('byte_size').notNullable();
    table.string('sha256', 64).notNullable();
    table.string('storage_key', 512).notNullable();
    table.string('source', 16).notNullable();
    table.text('synth_spec').nullable();
    table.text('notes').notNullable().defaultTo('');
    table.text('tags').notNullable().defaultTo('[]');
    table.text('annotations').notNullable().defaultTo('[]');
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.timestamp('updated_at', { useTz: true }).notNullable();
    table.unique(['owner_id', 'sha256']);
    table.index(['visibility', 'created_at']);
    table.index(['owner_id', 'created_at']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('captures');
}
