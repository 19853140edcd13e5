import type { Knex } from 'knex';

// Runs: the queue and its history. A run names a chain revision and a capture by id (no foreign
// keys to them: deleting a chain or capture must neither fail nor erase the record of what ran),
// keeping their names as they were. `pending_output_key` is the object a running attempt writes, so
// a restart can remove what a killed attempt left. `result_id` points at the cached result once the
// run has succeeded (or was answered from the cache).
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('runs', (table) => {
    table.string('id', 36).primary();
    table.string('requested_by', 36).notNullable().references('id').inTable('users').onDelete('CASCADE');
    table.string('chain_id', 36).notNullable();
    table.integer('chain_revision').notNullable();
    table.string('chain_name', 200).notNullable();
    table.string('capture_id', 36).notNullable();
    table.string('capture_name', 200).notNullable();
    table.string('cache_key', 64).notNullable();
    table.string('status', 16).notNullable();
    table.double('progress').notNullable().defaultTo(0);
    table.string('current_stage', 64).nullable();
    table.integer('attempt').notNullable().defaultTo(1);
    table.string('retry_of', 36).nullable();
    table.string('result_id', 36).nullable().references('id').inTable('run_results').onDelete('SET NULL');
    table.boolean('from_cache').notNullable().defaultTo(false);
    table.boolean('cancel_requested').notNullable().defaultTo(false);
    table.string('pending_output_key', 512).nullable();
    table.text('error_message').nullable();
    table.string('error_stage_id', 64).nullable();
    table.string('error_kind', 64).nullable();
    table.bigInteger('error_sample_index').nullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
    table.timestamp('started_at', { useTz: true }).nullable();
    table.timestamp('finished_at', { useTz: true }).nullable();
    table.integer('duration_ms').nullable();
    table.index(['status', 'created_at']);
    table.index(['requested_by', 'created_at']);
    table.index(['cache_key']);
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('runs');
}
