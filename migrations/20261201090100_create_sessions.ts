import type { Knex } from 'knex';

// `id` holds the SHA-256 (hex) of the session id, never the id itself: a leaked database then
// carries no session a thief could replay.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('sessions', (table) => {
    table.string('id', 64).primary();
    table.string('user_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    table.timestamp('expires_at', { useTz: true }).notNullable();
    table.index(['user_id']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('sessions');
}
