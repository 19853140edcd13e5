/**
 * A run as the API presents it (never the row: storage keys and cache keys stay on the server),
 * one page of the runs list, submissions, live status events and comparisons.
 */
import { z } from 'zod';
import { runSummarySchema } from './run-results';

export const runStatuses = ['queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export const runStatusSchema = z.enum(runStatuses);
export type RunStatus = z.infer<typeof runStatusSchema>;

export const presentedRunErrorSchema = z.object({
  message: z.string(),
  /** The stage that failed, or null when the capture itself (or the server) failed. */
  stageId: z.string().nullable(),
  /** The failing stage's kind, or `input` / `internal` / `quota`. */
  kind: z.string(),
  /** Input sample of that stage where it failed, or null when unknown. */
  sampleIndex: z.number().nullable(),
});
export type PresentedRunError = z.infer<typeof presentedRunErrorSchema>;

export const presentedRunSchema = z.object({
  id: z.string(),
  chain: z.object({ id: z.string(), name: z.string(), revision: z.number() }),
  capture: z.object({ id: z.string(), name: z.string() }),
  status: runStatusSchema,
  /** 0..1. */
  progress: z.number(),
  currentStage: z.string().nullable(),
  /** Estimated seconds left (s), or null when not running or too early to tell. */
  etaSeconds: z.number().nullable(),
  requestedBy: z.object({ id: z.string(), name: z.string() }),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  /** Wall time from start to end (ms), or null until finished. */
  durationMs: z.number().nullable(),
  fromCache: z.boolean(),
  attempt: z.number(),
  retryOf: z.string().nullable(),
  error: presentedRunErrorSchema.nullable(),
  permissions: z.object({ cancel: z.boolean(), retry: z.boolean() }),
  /** Only in GET /api/runs/:id of a succeeded run: readouts, issues, timing and test points (no plot data). */
  summary: runSummarySchema.optional(),
});
export type PresentedRun = z.infer<typeof presentedRunSchema>;

/** One page of GET /api/runs, newest first; `nextCursor` asks for the page after it (null on the last). */
export const runListSchema = z.object({
  runs: z.array(presentedRunSchema),
  total: z.number(),
  page: z.number(),
  pageSize: z.number(),
  nextCursor: z.string().nullable(),
});
export type RunList = z.infer<typeof runListSchema>;

/** What POST /api/runs and a retry answer per run. */
export const submittedRunSchema = z.object({ id: z.string(), status: runStatusSchema, fromCache: z.boolean() });
export type SubmittedRun = z.infer<typeof submittedRunSchema>;
export const submittedRunsSchema = z.object({ runs: z.array(submittedRunSchema) });
export type SubmittedRuns = z.infer<typeof submittedRunsSchema>;

/** A `status` event of GET /api/runs/:id/events. */
export const runStatusEventSchema = z.object({
  status: runStatusSchema,
  progress: z.number(),
  currentStage: z.string().nullable(),
  etaSeconds: z.number().nullable(),
});
export type RunStatusEvent = z.infer<typeof runStatusEventSchema>;

export const comparedSpectrumSchema = z.object({
  runId: z.string(),
  probe: z.string(),
  unit: z.string(),
  /** Hz, relative to the probed stream's 0 Hz. */
  frequencies: z.array(z.number()),
  levels: z.array(z.number().nullable()),
});
export type ComparedSpectrum = z.infer<typeof comparedSpectrumSchema>;

export const comparedReadoutSchema = z.object({
  probe: z.string(),
  name: z.string(),
  unit: z.string(),
  /** Value per run id (runs without this readout are absent). */
  values: z.record(z.number().nullable()),
  /** The run the differences are taken against: the first run (in request order) with a value. */
  baseline: z.string().nullable(),
  /** value - baseline value per run id, in the readout's unit (dB for levels). */
  differences: z.record(z.number().nullable()),
  /** Why a run has no value for this readout, per run id (only runs whose value is null with a reason). */
  reasons: z.record(z.string()).optional(),
});
export type ComparedReadout = z.infer<typeof comparedReadoutSchema>;

/** GET /api/runs/compare. */
export const runComparisonSchema = z.object({
  runs: z.array(presentedRunSchema),
  spectra: z.array(comparedSpectrumSchema),
  readouts: z.array(comparedReadoutSchema),
});
export type RunComparison = z.infer<typeof runComparisonSchema>;
