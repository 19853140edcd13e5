import type { Knex } from 'knex';

// Chains: the named, shared container of a series of immutable revisions. `latest_revision` is
// bumped in the same transaction that inserts a revision, so it is also the counter that numbers
// them. The fork origin is kept as plain ids, not a foreign key: deleting the original must not
// erase (or block) the record of where a fork came from.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('chains', (table) => {
    table.string('id', 36).primary();
    table.string('owner_id', 36).notNullable().references('id').inTable('users').onDelete('RESTRICT');
    table.string('name', 200).notNullable();
    table.text('description').notNullable().defaultTo('');
    table.string('visibility', 8).notNullable();
    table.integer('latest_revision').notNullable();
    table.string('forked_from_chain_id', 36).nullable();
    table.integer('forked_from_revision').nullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.timestamp('updated_at', { useTz: true }).notNullable();
    table.index(['visibility', 'updated_at']);
    table.index(['owner_id', 'updated_at']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('chains');
}
