/**
 * Messages between the scheduler (main thread) and a run worker. A job carries everything the
 * worker needs to read the capture and write the output, so the worker never opens the database:
 * the main thread owns every write to SQLite.
 */
import type { ChainDocument } from '@/dsp/chain';
import type { RunJobCapture } from '@/contracts/capture';
import type { PresentedRunError } from '@/contracts/run';
import type { ProbeDataEntry } from './probe-data';

/** What a worker is asked to do (sent as workerData). */
export interface RunJob {
  runId: string;
  document: ChainDocument;
  chain: { id: string; name: string; revision: number };
  capture: RunJobCapture;
  /** Fresh object key the output samples go to. */
  outputKey: string;
  /** Least time (ms) between two progress messages. */
  progressIntervalMs: number;
  /** Nice value (0..19) the worker thread runs at, so requests keep priority over runs. */
  niceness: number;
}

/** The output capture a successful worker stored. */
export interface StoredOutput {
  key: string;
  /** Bytes stored. */
  bytes: number;
  samples: number;
  /** SigMF metadata text describing the stored data. */
  meta: string;
}

export type WorkerMessage =
  | { type: 'progress'; fraction: number; samplesIn: number; stageId: string | null }
  | {
      type: 'succeeded';
      /** results.json text. */
      resultsJson: string;
      /** RunSummary JSON text. */
      summaryJson: string;
      probeData: ProbeDataEntry[];
      output: StoredOutput;
      seconds: number;
    }
  | { type: 'failed'; /** Where and why, as the run's page presents it. */ error: PresentedRunError; seconds: number }
  | { type: 'cancelled'; seconds: number };

/** The last message of a worker: how the run ended. */
export type WorkerOutcome = Exclude<WorkerMessage, { type: 'progress' }>;

export type SchedulerMessage = { type: 'cancel' };
