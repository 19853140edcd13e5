import type { Knex } from 'knex';

// Resumable (tus) uploads in flight: who owns each, what it will describe, and once complete the
// outcome (the capture, or the refusal as status + error JSON) for GET /api/uploads/:id/capture.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('capture_uploads', (table) => {
    table.string('id', 64).primary();
    table.string('owner_id', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    table.text('metadata').notNullable();
    table.bigInteger('upload_length').notNullable();
    table.string('status', 16).notNullable();
    table.string('capture_id', 36).nullable();
    table.integer('error_status').nullable();
    table.text('error').nullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.timestamp('expires_at', { useTz: true }).notNullable();
    table.index(['owner_id']);
    table.index(['expires_at']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('capture_uploads');
}
