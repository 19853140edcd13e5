/**
 * The run scheduler of this server process. The runs table is the queue; at most
 * QUADRILLE_RUN_CONCURRENCY runs execute at once. Whenever a slot is free the scheduler picks the
 * next queued run fairly (users take turns, each within their concurrent-run quota), claims it,
 * and executes it in a worker thread. Only one server process may run the queue of a data folder:
 * on start it takes back every run left running; on stop it lets executing runs finish within a
 * grace period and puts the others back in the queue.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import { ENGINE_VERSION } from '@/dsp/version';
import { readStoredChainDocument } from '@/contracts/chain';
import { getDb } from '../db';
import { getObjectStore } from '../captures/store';
import { findCapture, runJobCaptureOf } from '../captures/rows';
import { findRevision } from '../chains/rows';
import { quotaOf, quotasOf } from '../quota';
import { computeSecondsToday } from './usage';
import type { ObjectStore } from '../storage';
import { computationHash } from './cache-key';
import { progressIntervalMs, runConcurrency, workerNiceness } from './config';
import { pickNextRun, type QueuedRun } from './fairness';
import type { RunJob } from './protocol';
import type { RunRow } from './rows';
import {
  claimRun,
  completeFromCache,
  completeSucceeded,
  recordCancelled,
  recordFailure,
  recordProgress,
  requeueInterruptedRuns,
  requeueStoppedRun,
} from './transitions';
import { startWorker, type WorkerRun } from './worker-host';

/** Object key of a run attempt's output samples: fresh per attempt, so a put never overwrites. */
export function outputObjectKey(): string {
  return `run-outputs/${randomUUID()}/data`;
}

interface ActiveRun {
  userId: string;
  worker: WorkerRun | null;
  cancelled: boolean;
  /** Stopped by a shutdown: goes back to the queue rather than ending cancelled. */
  stopping: boolean;
  /** Settles when the run's execution (and its filing) is over. */
  done: Promise<void>;
}

export class RunScheduler {
  /** Runs claimed by this process, by id, with their worker once started. */
  private readonly active = new Map<string, ActiveRun>();
  private stopped = false;
  private readonly lastServed = new Map<string, number>();
  private served = 0;
  private pumping = false;
  private pumpAgain = false;

  constructor(
    private readonly db: Knex,
    private readonly store: ObjectStore,
    readonly concurrency: number = runConcurrency(),
  ) {}

  /** Takes back runs a previous process left running, then starts executing the queue. */
  async start(): Promise<number> {
    const requeued = await requeueInterruptedRuns(this.db, this.store);
    if (requeued > 0) console.log(`Requeued ${requeued} run(s) interrupted by the last shutdown.`);
    this.wake();
    return requeued;
  }

  /**
   * Stops taking runs from the queue and waits up to `graceMs` for executing runs to finish; the
   * ones still executing then are stopped, their output deleted, and put back in the queue.
   * Answers how many were put back.
   */
  async stop(graceMs: number): Promise<number> {
    this.stopped = true;
    const all = () => Promise.allSettled([...this.active.values()].map((run) => run.done));
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([all(), new Promise<void>((resolve) => (timer = setTimeout(resolve, graceMs)))]);
    clearTimeout(timer);
    const stopping = [...this.active.values()];
    for (const run of stopping) {
      run.stopping = true;
      run.worker?.cancel();
    }
    await all();
    return stopping.length;
  }

  /** Looks for queued runs to start (after a submission, a finish or a quota change). */
  wake(): void {
    if (this.stopped) return;
    void this.pump().catch((error: unknown) => console.error('Run scheduler could not pick the next run:', error));
  }

  /** Runs executing in this process now. */
  get executing(): number {
    return this.active.size;
  }

  /** Cancels a run: a queued one at once, a running one by stopping its worker. False when it had finished. */
  async cancel(run: Pick<RunRow, 'id' | 'requested_by' | 'status'>): Promise<boolean> {
    await this.db('runs').where({ id: run.id }).whereIn('status', ['queued', 'running']).update({ cancel_requested: true });
    const active = this.active.get(run.id);
    if (active) {
      active.cancelled = true;
      active.worker?.cancel();
      return true;
    }
    // Not executing here: a queued run (or a running row no process owns) ends now.
    return recordCancelled(this.db, run);
  }

  private async pump(): Promise<void> {
    if (this.pumping) {
      this.pumpAgain = true;
      return;
    }
    this.pumping = true;
    try {
      do {
        this.pumpAgain = false;
        while (!this.stopped && this.active.size < this.concurrency) {
          const next = await this.pickNext();
          if (!next) break;
          const outputKey = outputObjectKey();
          if (!(await claimRun(this.db, next.id, outputKey))) continue;
          this.lastServed.set(next.userId, ++this.served);
          const active: ActiveRun = { userId: next.userId, worker: null, cancelled: false, stopping: false, done: Promise.resolve() };
          this.active.set(next.id, active);
          active.done = this.execute(next.id, outputKey)
            .catch((error: unknown) => console.error(`Run ${next.id} could not be executed:`, error))
            .finally(() => {
              this.active.delete(next.id);
              this.wake();
            });
        }
      } while (this.pumpAgain);
    } finally {
      this.pumping = false;
    }
  }

  private async pickNext(): Promise<QueuedRun | null> {
    const queued = (await this.db('runs')
      .where({ status: 'queued' })
      .orderBy([{ column: 'created_at' }, { column: 'id' }])
      .limit(2000)
      .select('id', 'requested_by')) as Pick<RunRow, 'id' | 'requested_by'>[];
    if (queued.length === 0) return null;
    const runningRows = (await this.db('runs').where({ status: 'running' }).groupBy('requested_by').select('requested_by').count({ count: '*' })) as {
      requested_by: string;
      count: number | string;
    }[];
    const running = new Map(runningRows.map((row) => [row.requested_by, Number(row.count)]));
    const quotas = await quotasOf(this.db, queued.map((run) => run.requested_by));
    // A quota of 0 concurrent runs would park the user's runs forever; it means "one at a time".
    const limits = new Map([...quotas].map(([userId, quota]) => [userId, Math.max(1, quota.concurrentRuns)]));
    return pickNextRun(
      queued.map((run) => ({ id: run.id, userId: run.requested_by })),
      { running, limits, lastServed: this.lastServed },
    );
  }

  private async execute(runId: string, outputKey: string): Promise<void> {
    const run = (await this.db('runs').where({ id: runId }).first()) as RunRow | undefined;
    if (!run || run.status !== 'running') return;
    const revision = await findRevision(this.db, run.chain_id, run.chain_revision);
    const capture = await findCapture(this.db, run.capture_id);
    if (!revision || !capture) {
      const what = !revision ? `chain revision ${run.chain_revision} was deleted` : 'capture was deleted';
      await recordFailure(this.db, run, { message: `The ${what} before the run started.`, stageId: null, kind: 'input', sampleIndex: null }, 0);
      return;
    }
    const document = readStoredChainDocument(revision.document);
    // Submission keyed the run; the key is not worked out again here (the chain hash is only filed).
    const facts = { cacheKey: run.cache_key, chainHash: computationHash(document), captureSha256: capture.sha256, engineVersion: ENGINE_VERSION };
    // An identical run may have finished while this one waited in the queue.
    const cached = (await this.db('run_results').where({ cache_key: facts.cacheKey }).first('id')) as { id: string } | undefined;
    if (cached) {
      await completeFromCache(this.db, run, cached.id);
      return;
    }
    // Submission checked the compute quota, but runs queued before earlier ones used it up must
    // not start on time the user no longer has (cache hits above cost nothing and still answer).
    const [quota, used] = await Promise.all([quotaOf(this.db, run.requested_by), computeSecondsToday(this.db, run.requested_by)]);
    if (used >= quota.computeSecondsPerDay) {
      const message = `Your ${quota.computeSecondsPerDay} compute seconds for today were used up (${Math.round(used)} s) while this run waited in the queue; retry it after 00:00 UTC.`;
      await recordFailure(this.db, run, { message, stageId: null, kind: 'quota', sampleIndex: null }, 0);
      return;
    }
    const job: RunJob = {
      runId,
      document,
      chain: { id: run.chain_id, name: run.chain_name, revision: run.chain_revision },
      capture: runJobCaptureOf(capture),
      outputKey,
      progressIntervalMs: progressIntervalMs(),
      niceness: workerNiceness(),
    };
    const active = this.active.get(runId)!;
    const worker = startWorker(job, (message) => {
      // A lost progress update only delays the bar; the next one (or the end) corrects it.
      recordProgress(this.db, runId, message.fraction, message.stageId).catch((error: unknown) => console.error(`Run ${runId}: progress not recorded:`, error));
    });
    active.worker = worker;
    if (active.cancelled || active.stopping) worker.cancel();
    const outcome = await worker.outcome;
    if (outcome.type === 'succeeded') {
      const filed = await completeSucceeded(
        this.db,
        run,
        facts,
        outcome.output,
        { resultsJson: outcome.resultsJson, summaryJson: outcome.summaryJson, probeData: outcome.probeData },
        outcome.seconds,
      ).catch(async (error: unknown) => {
        console.error(`Run ${runId}: could not file its results:`, error);
        await recordFailure(this.db, run, { message: 'The results could not be saved.', stageId: null, kind: 'internal', sampleIndex: null }, outcome.seconds);
        return { status: 'failed' as const, orphanKey: outcome.output.key };
      });
      if (filed.orphanKey) await this.deleteOutput(runId, filed.orphanKey);
      return;
    }
    // Whatever a stopped or failed worker wrote is not a result.
    await this.deleteOutput(runId, outputKey);
    if (active.stopping && !active.cancelled && outcome.type === 'cancelled') await requeueStoppedRun(this.db, run);
    else if (outcome.type === 'failed') await recordFailure(this.db, run, outcome.error, outcome.seconds);
    else await recordCancelled(this.db, run, outcome.seconds);
  }

  /** Deletes an output object no run keeps; a failure is logged with the key, so it can be removed by hand. */
  private async deleteOutput(runId: string, key: string): Promise<void> {
    try {
      await this.store.delete(key);
    } catch (error) {
      console.error(`Run ${runId}: could not delete its unused output object ${key}:`, error);
    }
  }
}

const holderKey = Symbol.for('quadrille.runScheduler');
type Holder = { [holderKey]?: RunScheduler };

/** The scheduler of this process (made on first use). */
export function getRunScheduler(): RunScheduler {
  const holder = globalThis as Holder;
  holder[holderKey] ??= new RunScheduler(getDb(), getObjectStore());
  return holder[holderKey];
}

/** Starts this process's scheduler: requeues interrupted runs and begins executing the queue. */
export async function startRunScheduler(): Promise<void> {
  await getRunScheduler().start();
}

/** Stops this process's scheduler if it was made: running runs finish within `graceMs` or go back to the queue. */
export async function stopRunScheduler(graceMs: number): Promise<number> {
  const scheduler = (globalThis as Holder)[holderKey];
  return scheduler ? scheduler.stop(graceMs) : 0;
}
