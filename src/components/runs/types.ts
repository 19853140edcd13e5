/**
 * Shapes of the runs API as the browser sees them: all declared in src/contracts, re-exported here
 * for the run islands, with the few helpers they share.
 */
import type { RunStatus } from '@/contracts/run';

export type {
  ComparedReadout,
  ComparedSpectrum,
  PresentedRun as Run,
  RunComparison,
  RunList,
  RunStatus,
  RunStatusEvent,
  SubmittedRuns,
} from '@/contracts/run';
export type {
  ConstellationPlotData,
  PlotData,
  PlotDataByKind,
  PlotKind,
  RunSummary,
  SpectrogramPlotData,
  SpectrumPlotData,
  TestPoint,
  TracePlotData,
} from '@/contracts/run-results';

/** Statuses that still change. */
export const activeStatuses: ReadonlySet<RunStatus> = new Set(['queued', 'running']);

/** True while the run may still change (queued or running). */
export function isActive(status: RunStatus): boolean {
  return activeStatuses.has(status);
}
