/** Runs: the queue, its scheduler and workers, the result cache, presenters and exports. */
export { loadRunFor, loadRunsFor } from './access';
export { cacheKey, computationHash } from './cache-key';
export { compareResults, loadComparedRuns, type ComparedReadout, type ComparedSpectrum } from './compare';
export { runConcurrency, heartbeatMs, progressIntervalMs } from './config';
export { publishRunNotice, subscribeRun, type RunNotice } from './events';
export { levelColumn, readoutsCsv, spectrumCsv, spectrumProbe } from './export';
export { pickNextRun, type QueuedRun } from './fairness';
export { listRuns, type RunQuery } from './list';
export { assertPlotWidth, plotKinds, reducePlot, type PlotKind } from './plot';
export { PREVIEW_POINTS, PREVIEW_WIDTH, probeDataEntries, summarizeResults } from './probe-data';
export { estimateSecondsLeft, presentRun, type PresentedRun, type PresentedRunError } from './present';
export { probePlotOf, resultRowOf, summariesOf, summaryOf } from './results';
export { findRun, finishedStatuses, runResource, runStatuses, type RunRow, type RunStatus, type RunView } from './rows';
export { getRunScheduler, startRunScheduler, RunScheduler } from './scheduler';
export { retryRun, submitRuns, type RunRequest, type SubmittedRun } from './submit';
export { computeSecondsToday } from './usage';
