/**
 * Asking for runs: a chain revision on one or more captures (one run each), and retrying a failed
 * or cancelled run as a new attempt. Everything is checked before anything is written: access to
 * the chain and every capture (a hidden one answers 404), that the chain can run on each capture's
 * format, and the quotas. A run whose result is cached is answered at once as succeeded.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { access, type Actor } from '@/lib/permissions';
import { propagateChain, type ChainDocument } from '@/dsp/chain';
import { streamFormatOf } from '@/contracts/capture';
import { readStoredChainDocument } from '@/contracts/chain';
import { ENGINE_VERSION } from '@/dsp/version';
import { ApiError, conflict, forbidden, unprocessable } from '../api/errors';
import { captureFormatOf, findCaptures, type CaptureWithOwner } from '../captures/rows';
import { chainResource, findChain, findRevision } from '../chains/rows';
import { cacheKey, computationHash } from './cache-key';
import type { SubmittedRun } from '@/contracts/run';
import type { RunRow, RunView } from './rows';
import { publishRunNotice } from './events';
import { assertComputeLeft, assertRoomInQueue } from './usage';

export interface RunRequest {
  chainId: string;
  /** Revision number; absent means the latest. */
  revision?: number;
  captureIds: string[];
  /** Request field naming capture i in errors (`capture_id` or `capture_ids[i]`). */
  captureField(index: number): string;
}

export type { SubmittedRun };

/** Computation hashes of revisions by id: revisions never change, so each is hashed once (bounded). */
const revisionHashes = new Map<string, string>();
const MAX_REMEMBERED_REVISIONS = 1000;

function revisionComputationHash(revisionId: string, document: ChainDocument): string {
  let hash = revisionHashes.get(revisionId);
  if (hash === undefined) {
    hash = computationHash(document);
    if (revisionHashes.size >= MAX_REMEMBERED_REVISIONS) revisionHashes.delete(revisionHashes.keys().next().value!);
    revisionHashes.set(revisionId, hash);
  }
  return hash;
}

/** 404 naming the request field, worded like every other missing item. */
function missing(what: string, field: string): ApiError {
  return new ApiError(404, 'not_found', `No such ${what}.`, field);
}

/** The captures of the request in its order, read in one query; 404 naming the first one missing or hidden. */
async function loadCaptures(db: Knex, user: Actor, request: RunRequest): Promise<CaptureWithOwner[]> {
  const found = await findCaptures(db, request.captureIds);
  const captures: CaptureWithOwner[] = [];
  for (const [index, id] of request.captureIds.entries()) {
    const capture = found.get(id);
    const outcome = capture ? access(user, 'capture.read', { ownerId: capture.owner_id, visibility: capture.visibility }) : 'hidden';
    if (outcome !== 'allowed') {
      throw missing('capture', request.captureField(index));
    }
    captures.push(capture!);
  }
  return captures;
}

/** Creates the runs of `request` for `user` (attempt 1, or a retry of `retryOf`); answers them in request order. */
export async function submitRuns(db: Knex, user: Actor, request: RunRequest, retryOf: RunRow | null = null): Promise<SubmittedRun[]> {
  const chain = await findChain(db, request.chainId);
  const chainAccess = chain ? access(user, 'run.create', chainResource(chain)) : 'hidden';
  if (chainAccess === 'hidden') throw missing('chain', 'chain_id');
  if (chainAccess === 'forbidden') throw forbidden('Your role may not run chains.');
  const revisionNumber = request.revision ?? chain!.latest_revision;
  const revision = await findRevision(db, chain!.id, revisionNumber);
  if (!revision) throw missing(`revision ${revisionNumber} of this chain`, 'revision');
  const document = readStoredChainDocument(revision.document);
  const captures = await loadCaptures(db, user, request);

  const chainHash = revisionComputationHash(revision.id, document);
  const keys = captures.map((capture) => cacheKey(chainHash, capture.sha256, ENGINE_VERSION));
  const cachedRows = (await db('run_results').whereIn('cache_key', [...new Set(keys)]).select('id', 'cache_key')) as { id: string; cache_key: string }[];
  const cached = new Map(cachedRows.map((row) => [row.cache_key, row.id]));

  // A cached result proves the chain ran on those bytes; only the others are checked.
  for (const [index, capture] of captures.entries()) {
    if (cached.has(keys[index]!)) continue;
    const errors = propagateChain(document, streamFormatOf(captureFormatOf(capture))).flatMap((stage) => stage.issues).filter((issue) => issue.severity === 'error');
    if (errors.length > 0) {
      throw unprocessable('chain_cannot_run', `The chain cannot run on capture "${capture.name}": ${errors[0]!.message}`, request.captureField(index));
    }
  }
  const misses = keys.filter((key) => !cached.has(key)).length;

  const now = new Date().toISOString();
  const rows: RunRow[] = captures.map((capture, index) => {
    const resultId = cached.get(keys[index]!) ?? null;
    return {
      id: randomUUID(),
      requested_by: user.id,
      chain_id: chain!.id,
      chain_revision: revisionNumber,
      chain_name: chain!.name,
      capture_id: capture.id,
      capture_name: capture.name,
      cache_key: keys[index]!,
      status: resultId ? 'succeeded' : 'queued',
      progress: resultId ? 1 : 0,
      current_stage: null,
      attempt: retryOf ? retryOf.attempt + 1 : 1,
      retry_of: retryOf?.id ?? null,
      result_id: resultId,
      from_cache: resultId !== null,
      cancel_requested: false,
      pending_output_key: null,
      error_message: null,
      error_stage_id: null,
      error_kind: null,
      error_sample_index: null,
      created_at: now,
      started_at: resultId ? now : null,
      finished_at: resultId ? now : null,
      duration_ms: resultId ? 0 : null,
    };
  });
  await db.transaction(async (trx) => {
    // Checked in the transaction that inserts, so two requests at once cannot both pass the limit.
    if (misses > 0) {
      await assertComputeLeft(trx, user.id);
      await assertRoomInQueue(trx, user.id, misses);
    }
    // Many captures at once: insert in slices well below SQLite's bound-variable limit.
    for (let start = 0; start < rows.length; start += 20) await trx('runs').insert(rows.slice(start, start + 20));
  });
  for (const row of rows) publishRunNotice({ runId: row.id, status: row.status, progress: row.progress, currentStage: null });
  return rows.map((row) => ({ id: row.id, status: row.status, fromCache: row.from_cache === true }));
}

/** A new attempt of a failed or cancelled run (same chain revision and capture); 409 for any other status. */
export async function retryRun(db: Knex, user: Actor, run: RunView): Promise<SubmittedRun> {
  if (run.status !== 'failed' && run.status !== 'cancelled') {
    throw conflict('not_retryable', `Only a failed or cancelled run can be retried; this one is ${run.status}.`);
  }
  const [submitted] = await submitRuns(
    db,
    user,
    { chainId: run.chain_id, revision: run.chain_revision, captureIds: [run.capture_id], captureField: () => 'capture_id' },
    run,
  );
  return submitted!;
}
