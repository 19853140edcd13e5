import type { Knex } from 'knex';

// Compute seconds each user spent per UTC day (runs that finished, whatever their outcome), the
// figure the daily compute quota is checked against. Kept apart from runs so the count survives
// deleting old runs.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('compute_usage', (table) => {
    table.string('user_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    table.string('day', 10).notNullable();
    table.double('seconds').notNullable().defaultTo(0);
    table.primary(['user_id', 'day']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('compute_usage');
}
