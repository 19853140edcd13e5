import type { Knex } from 'knex';

// Accounts. Timestamps are ISO-8601 UTC strings so they sort as text on SQLite and parse on PostgreSQL.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('users', (table) => {
    table.string('id', 36).primary();
    table.string('email', 254).notNullable().unique();
    table.string('name', 100).notNullable();
    table.string('role', 16).notNullable();
    table.string('password_hash', 255).notNullable();
    table.timestamp('disabled_at', { useTz: true }).nullable();
    table.timestamp('last_sign_in_at', { useTz: true }).nullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.timestamp('updated_at', { useTz: true }).notNullable();
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('users');
}
