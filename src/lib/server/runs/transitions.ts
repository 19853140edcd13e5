/**
 * Every change of a run's status, each one statement or one transaction, so a run is never seen
 * half-changed: claimed (queued -> running), progress, succeeded (result row, run row and compute
 * usage together, only after the output object is stored), answered from the cache, failed,
 * cancelled, and put back in the queue after a restart.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { ObjectStore } from '../storage';
import type { ProbeDataEntry } from './probe-data';
import type { PresentedRunError } from '@/contracts/run';
import type { StoredOutput } from './protocol';
import type { RunProbeDataRow, RunResultRow, RunRow } from './rows';
import { publishRunNotice } from './events';

/** UTC day (YYYY-MM-DD) a time falls on; compute quotas count per UTC day. */
export function utcDay(when: Date = new Date()): string {
  return when.toISOString().slice(0, 10);
}

/** Adds `seconds` (s) of compute to a user's count for today. */
export async function addComputeUsage(db: Knex, userId: string, seconds: number, when: Date = new Date()): Promise<void> {
  if (!(seconds > 0)) return;
  await db('compute_usage')
    .insert({ user_id: userId, day: utcDay(when), seconds })
    .onConflict(['user_id', 'day'])
    .merge({ seconds: db.raw('compute_usage.seconds + excluded.seconds') });
}

function notify(run: Pick<RunRow, 'id'>, status: string, progress: number, currentStage: string | null = null): void {
  publishRunNotice({ runId: run.id, status, progress, currentStage });
}

function durationMs(run: Pick<RunRow, 'started_at'>, finished: Date): number {
  return run.started_at ? Math.max(0, finished.getTime() - new Date(run.started_at).getTime()) : 0;
}

/** Marks a queued run running and records the object key its output will go to; false if it was no longer queued. */
export async function claimRun(db: Knex, runId: string, outputKey: string): Promise<boolean> {
  const updated = await db('runs')
    .where({ id: runId, status: 'queued' })
    .update({ status: 'running', started_at: new Date().toISOString(), progress: 0, current_stage: null, pending_output_key: outputKey });
  if (updated > 0) notify({ id: runId }, 'running', 0);
  return updated > 0;
}

/** Records progress (0..1) and the stage being flushed (or null) of a running run. */
export async function recordProgress(db: Knex, runId: string, progress: number, currentStage: string | null): Promise<void> {
  await db('runs').where({ id: runId, status: 'running' }).update({ progress, current_stage: currentStage });
  notify({ id: runId }, 'running', progress, currentStage);
}

/** What the cache row of a fresh result is filed under. */
export interface CacheFacts {
  cacheKey: string;
  chainHash: string;
  captureSha256: string;
  engineVersion: string;
}

/** What a worker hands over of a successful run, ready to file (JSON texts). */
export interface FiledResults {
  resultsJson: string;
  summaryJson: string;
  probeData: ProbeDataEntry[];
}

/** Inserts a result's probe data rows, in slices well below SQLite's bound-variable limit. */
export async function insertProbeData(db: Knex, resultId: string, entries: ProbeDataEntry[]): Promise<void> {
  const rows: RunProbeDataRow[] = entries.map((entry) => ({ result_id: resultId, stage_id: entry.stageId, kind: entry.kind, data: entry.data, preview: entry.preview }));
  for (let start = 0; start < rows.length; start += 50) await db('run_probe_data').insert(rows.slice(start, start + 50));
}

/** Thrown inside the success transaction when the run was cancelled while its output was being stored. */
class CancelledMeanwhile extends Error {}

/**
 * Files a successful run: the result row (or, when an identical run finished first, that one's),
 * the run marked succeeded and the compute seconds counted, in one transaction. Answers the output
 * key that is no longer needed (to delete), or null. A run cancelled meanwhile ends cancelled.
 */
export async function completeSucceeded(
  db: Knex,
  run: RunRow,
  facts: CacheFacts,
  output: StoredOutput,
  filed: FiledResults,
  seconds: number,
): Promise<{ status: 'succeeded' | 'cancelled'; orphanKey: string | null }> {
  const finished = new Date();
  try {
    const orphanKey = await db.transaction(async (trx) => {
      const current = (await trx('runs').where({ id: run.id }).first()) as RunRow | undefined;
      if (!current || current.status !== 'running' || current.cancel_requested) throw new CancelledMeanwhile();
      const twin = (await trx('run_results').where({ cache_key: facts.cacheKey }).first('id')) as Pick<RunResultRow, 'id'> | undefined;
      let resultId = twin?.id;
      if (!resultId) {
        const row: RunResultRow = {
          id: randomUUID(),
          cache_key: facts.cacheKey,
          chain_hash: facts.chainHash,
          capture_sha256: facts.captureSha256,
          engine_version: facts.engineVersion,
          results: filed.resultsJson,
          summary: filed.summaryJson,
          output_key: output.key,
          output_meta: output.meta,
          output_bytes: output.bytes,
          output_samples: output.samples,
          compute_seconds: seconds,
          created_at: finished.toISOString(),
        };
        await trx('run_results').insert(row);
        await insertProbeData(trx, row.id, filed.probeData);
        resultId = row.id;
      }
      await trx('runs').where({ id: run.id }).update({
        status: 'succeeded',
        progress: 1,
        current_stage: null,
        result_id: resultId,
        pending_output_key: null,
        finished_at: finished.toISOString(),
        duration_ms: durationMs(current, finished),
      });
      await addComputeUsage(trx, run.requested_by, seconds, finished);
      return twin ? output.key : null;
    });
    notify(run, 'succeeded', 1);
    return { status: 'succeeded', orphanKey };
  } catch (error) {
    if (!(error instanceof CancelledMeanwhile)) throw error;
    await recordCancelled(db, run, seconds);
    return { status: 'cancelled', orphanKey: output.key };
  }
}

/** Ends a claimed run with an existing cached result (an identical run finished while this one waited). */
export async function completeFromCache(db: Knex, run: RunRow, resultId: string): Promise<void> {
  const finished = new Date().toISOString();
  await db('runs')
    .where({ id: run.id, status: 'running' })
    .update({ status: 'succeeded', progress: 1, result_id: resultId, from_cache: true, pending_output_key: null, finished_at: finished, duration_ms: 0 });
  notify(run, 'succeeded', 1);
}

/** Ends a run as failed with where and why; its compute seconds still count. */
export async function recordFailure(db: Knex, run: RunRow, failure: PresentedRunError, seconds: number): Promise<void> {
  const finished = new Date();
  await db.transaction(async (trx) => {
    const current = (await trx('runs').where({ id: run.id }).first()) as RunRow | undefined;
    if (!current || current.status !== 'running') return;
    await trx('runs')
      .where({ id: run.id })
      .update({
        status: current.cancel_requested ? 'cancelled' : 'failed',
        current_stage: null,
        pending_output_key: null,
        error_message: current.cancel_requested ? null : failure.message.slice(0, 4000),
        error_stage_id: current.cancel_requested ? null : failure.stageId,
        error_kind: current.cancel_requested ? null : failure.kind,
        error_sample_index: current.cancel_requested ? null : failure.sampleIndex,
        finished_at: finished.toISOString(),
        duration_ms: durationMs(current, finished),
      });
    await addComputeUsage(trx, run.requested_by, seconds, finished);
  });
  const after = (await db('runs').where({ id: run.id }).first('status', 'progress')) as Pick<RunRow, 'status' | 'progress'>;
  notify(run, after.status, after.progress);
}

/** Ends a queued or running run as cancelled; false when it had already finished. */
export async function recordCancelled(db: Knex, run: Pick<RunRow, 'id' | 'requested_by'>, seconds = 0): Promise<boolean> {
  const finished = new Date();
  const changed = await db.transaction(async (trx) => {
    const current = (await trx('runs').where({ id: run.id }).first()) as RunRow | undefined;
    if (!current || (current.status !== 'queued' && current.status !== 'running')) return false;
    await trx('runs')
      .where({ id: run.id })
      .update({
        status: 'cancelled',
        cancel_requested: true,
        current_stage: null,
        pending_output_key: null,
        finished_at: finished.toISOString(),
        duration_ms: durationMs(current, finished),
      });
    await addComputeUsage(trx, run.requested_by, seconds, finished);
    return true;
  });
  if (changed) {
    const after = (await db('runs').where({ id: run.id }).first('progress')) as Pick<RunRow, 'progress'>;
    notify(run, 'cancelled', after.progress);
  }
  return changed;
}

/** Puts a run this process stopped at shutdown back in the queue (its output was deleted); no compute seconds are counted. */
export async function requeueStoppedRun(db: Knex, run: Pick<RunRow, 'id'>): Promise<void> {
  const updated = await db('runs')
    .where({ id: run.id, status: 'running' })
    .update({ status: 'queued', progress: 0, current_stage: null, started_at: null, pending_output_key: null });
  if (updated > 0) notify(run, 'queued', 0);
}

/**
 * After a restart: runs left running by a process that died are queued again, and whatever their
 * killed attempts were writing is removed. Answers how many runs were put back.
 */
export async function requeueInterruptedRuns(db: Knex, store: ObjectStore): Promise<number> {
  const interrupted = (await db('runs').where({ status: 'running' }).select('id', 'pending_output_key', 'cancel_requested')) as RunRow[];
  for (const run of interrupted) {
    if (run.pending_output_key) {
      try {
        await store.delete(run.pending_output_key);
      } catch (error) {
        console.error(`Run ${run.id}: could not delete the output object ${run.pending_output_key} of its interrupted attempt:`, error);
      }
    }
    if (run.cancel_requested) {
      await db('runs').where({ id: run.id }).update({ status: 'cancelled', pending_output_key: null, finished_at: new Date().toISOString() });
      continue;
    }
    await db('runs')
      .where({ id: run.id, status: 'running' })
      .update({ status: 'queued', progress: 0, current_stage: null, started_at: null, pending_output_key: null });
  }
  return interrupted.filter((run) => !run.cancel_requested).length;
}
