/**
 * Rows of the runs and run_results tables and the one query every run read starts from: the run
 * with its requester's name and the visibility of its chain and capture (which decide who else may
 * see it). Rows never leave the server: presenters shape them.
 */
import type { Knex } from 'knex';
import type { OwnedResource } from '@/lib/permissions';

import { runStatuses, type RunStatus } from '@/contracts/run';

export { runStatuses, type RunStatus };

/** Statuses a run never leaves. */
export const finishedStatuses: ReadonlySet<RunStatus> = new Set(['succeeded', 'failed', 'cancelled']);

export interface RunRow {
  id: string;
  requested_by: string;
  chain_id: string;
  chain_revision: number;
  chain_name: string;
  capture_id: string;
  capture_name: string;
  /** SHA-256 (hex) over the computation-only chain hash, capture sha256 and engine version. */
  cache_key: string;
  status: RunStatus;
  /** 0..1. */
  progress: number;
  current_stage: string | null;
  attempt: number;
  retry_of: string | null;
  result_id: string | null;
  from_cache: boolean | number;
  cancel_requested: boolean | number;
  pending_output_key: string | null;
  error_message: string | null;
  error_stage_id: string | null;
  error_kind: string | null;
  error_sample_index: number | null;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
  duration_ms: number | null;
}

/** A run with what its presentation and access checks need. */
export interface RunView extends RunRow {
  requester_name: string;
  /** Null when the chain or capture was deleted since. */
  chain_owner_id: string | null;
  chain_visibility: 'private' | 'team' | null;
  capture_owner_id: string | null;
  capture_visibility: 'private' | 'team' | null;
}

export interface RunResultRow {
  id: string;
  cache_key: string;
  chain_hash: string;
  capture_sha256: string;
  engine_version: string;
  /** JSON text in the engine's results.json shape (what the JSON export sends). */
  results: string;
  /** RunSummary JSON text; null only for a result filed before summaries existed, until start-up fills it. */
  summary: string | null;
  output_key: string;
  /** SigMF metadata text of the output capture. */
  output_meta: string;
  output_bytes: number;
  output_samples: number;
  compute_seconds: number;
  created_at: string;
}

/** One probe's data of one plot kind for a cached result (PlotData JSON texts). */
export interface RunProbeDataRow {
  result_id: string;
  stage_id: string;
  kind: string;
  data: string;
  preview: string;
}

/** Runs joined with requester names and the visibility of their chains and captures. */
export function runQuery(db: Knex): Knex.QueryBuilder {
  return db('runs')
    .join('users', 'users.id', 'runs.requested_by')
    .leftJoin('chains', 'chains.id', 'runs.chain_id')
    .leftJoin('captures', 'captures.id', 'runs.capture_id')
    .select(
      'runs.*',
      'users.name as requester_name',
      'chains.owner_id as chain_owner_id',
      'chains.visibility as chain_visibility',
      'captures.owner_id as capture_owner_id',
      'captures.visibility as capture_visibility',
    );
}

/** The run with this id, or undefined (also for ids that are not UUIDs). */
export async function findRun(db: Knex, id: string): Promise<RunView | undefined> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return undefined;
  return (await runQuery(db).where('runs.id', id).first()) as RunView | undefined;
}

/**
 * The ownership facts of a run: its requester owns it; others may see it only while both its chain
 * and its capture are team items (a run shows what both hold).
 */
export function runResource(run: RunView): OwnedResource {
  const shared = run.chain_visibility === 'team' && run.capture_visibility === 'team';
  return { ownerId: run.requested_by, visibility: shared ? 'team' : 'private' };
}

/** SQLite hands booleans back as 0/1. */
export function flag(value: boolean | number): boolean {
  return value === true || value === 1;
}
