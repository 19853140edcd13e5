/**
 * Reading a run's results back: the cached result row a succeeded run points at, and its JSON in
 * the command line's results.json shape (probes with spectra, readouts, spectrograms, traces).
 */
import type { Knex } from 'knex';
import type { ChainIssue, SpectrogramResult, StreamFormat, TraceResult } from '@/dsp/types';
import { ApiError } from '../api/errors';
import type { RunResultRow, RunView } from './rows';

/** One probe of results.json (levels may be null where the engine had -Infinity or NaN). */
export interface ResultProbe {
  stageId: string;
  kind: string;
  format: StreamFormat;
  spectrum?: {
    unit: string;
    peak: { frequency: number; level: number | null };
    resolutionBandwidth: number;
    segments: number;
    frequencies: number[];
    levels: (number | null)[];
  };
  readouts?: { name: string; value: number | null; unit: string }[];
  spectrogram?: SpectrogramResult;
  trace?: TraceResult;
  constellation?: number[];
}

/** results.json as the command line writes it (src/cli/results.ts); paths name API resources here. */
export interface RunResults {
  engineVersion: string;
  createdAt: string;
  chain: { path: string; name: string; stages: { id: string; kind: string; probe?: boolean; bypass?: boolean }[] };
  input: {
    path: string;
    container: string;
    datatype: string;
    layout: string;
    /** Hz. */
    sampleRate: number;
    /** Hz, or null. */
    centerFrequency: number | null;
    samples: number;
    /** s. */
    durationSeconds: number;
  };
  output: { meta: string; data: string; datatype: string; layout: string; sampleRate: number; centerFrequency: number | null; samples: number };
  probes: ResultProbe[];
  issues: ChainIssue[];
  /** Run time (s) and input samples per second. */
  timing: { seconds: number; inputSamplesPerSecond: number | null };
}

/** 409 for a run that has no results (yet, or ever). */
export function noResults(run: RunView): ApiError {
  return new ApiError(409, 'no_results', `This run is ${run.status}; only a succeeded run has results.`);
}

/** The result row of a succeeded run; 409 `no_results` otherwise. */
export async function resultRowOf(db: Knex, run: RunView): Promise<RunResultRow> {
  if (run.status !== 'succeeded' || !run.result_id) throw noResults(run);
  const row = (await db('run_results').where({ id: run.result_id }).first()) as RunResultRow | undefined;
  if (!row) throw noResults(run);
  return row;
}

/** The parsed results of a succeeded run; 409 `no_results` otherwise. */
export async function resultsOf(db: Knex, run: RunView): Promise<RunResults> {
  return JSON.parse((await resultRowOf(db, run)).results) as RunResults;
}
