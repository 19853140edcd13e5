import type { Knex } from 'knex';

// Per-user quota overrides. A null column means "the configured default" (QUADRILLE_QUOTA_*), so
// changing a default in the configuration reaches every user who has no override.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('user_quotas', (table) => {
    table.string('user_id', 36).primary().references('id').inTable('users').onDelete('CASCADE');
    table.bigInteger('storage_bytes').nullable();
    table.bigInteger('largest_capture_bytes').nullable();
    table.integer('compute_seconds_per_day').nullable();
    table.integer('concurrent_runs').nullable();
    table.timestamp('updated_at', { useTz: true }).notNullable();
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('user_quotas');
}
