import type { Knex } from 'knex';

// Failed sign-ins, counted per account e-mail and per client address to rate limit guessing.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('sign_in_failures', (table) => {
    table.increments('id');
    table.string('account_email', 254).notNullable();
    table.string('address', 64).notNullable();
    table.timestamp('failed_at', { useTz: true }).notNullable();
    table.index(['account_email', 'failed_at']);
    table.index(['address', 'failed_at']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('sign_in_failures');
}
