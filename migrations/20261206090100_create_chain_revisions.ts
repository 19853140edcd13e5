import type { Knex } from 'knex';

// Immutable numbered revisions of a chain. (chain_id, revision) is unique so two concurrent saves
// can never share a number, whatever the application does; `hash` is the SHA-256 of the canonical
// chain JSON, which runs use as part of their cache key.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('chain_revisions', (table) => {
    table.string('id', 36).primary();
    table.string('chain_id', 36).notNullable().references('id').inTable('chains').onDelete('CASCADE');
    table.integer('revision').notNullable();
    table.text('document').notNullable();
    table.string('message', 500).notNullable().defaultTo('');
    table.string('author_id', 36).notNullable().references('id').inTable('users').onDelete('RESTRICT');
    table.string('hash', 64).notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.unique(['chain_id', 'revision']);
    table.index(['hash']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('chain_revisions');
}
