import type { Knex } from 'knex';

// Cached results of a chain on a capture: one row per cache key (SHA-256 over the computation-only
// canonical chain, the capture's sha256 and the engine version), so asking the same question again
// is answered from here. Results (readouts, spectra, reduced traces) are JSON text; the output
// capture's samples live in the object store under `output_key`, its SigMF metadata here. A row is
// only ever inserted once its output object is complete, in the same transaction that marks the
// run succeeded.
export async function up(db: Knex): Promise<void> {
  await db.schema.createTable('run_results', (table) => {
    table.string('id', 36).primary();
    table.string('cache_key', 64).notNullable().unique();
    table.string('chain_hash', 64).notNullable();
    table.string('capture_sha256', 64).notNullable();
    table.string('engine_version', 32).notNullable();
    table.text('results').notNullable();
    table.string('output_key', 512).notNullable();
    table.text('output_meta').notNullable();
    table.bigInteger('output_bytes').notNullable();
    table.bigInteger('output_samples').notNullable();
    table.double('compute_seconds').notNullable();
    table.timestamp('created_at', { useTz: true }).notNullable();
  });
}

export async function down(db: Knex): Promise<void> {
  await db.schema.dropTable('run_results');
}
