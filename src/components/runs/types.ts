/**
 * Shapes of the runs API as the browser sees them. The server's presenters define them; islands
 * take the types only (never server code), so a change of the contract fails the type check here.
 */
import type { ComparedReadout, ComparedSpectrum, PresentedRun, ResultProbe, RunStatus } from '@/lib/server/runs';
import type { StreamFormat } from '@/dsp/types';

export type { ComparedReadout, ComparedSpectrum, ResultProbe, RunStatus };

/** The parts of results.json the run page reads (the command line's shape). */
export interface RunResults {
  engineVersion?: string;
  input?: { layout: string; sampleRate: number; centerFrequency: number | null; samples: number; durationSeconds: number };
  output?: { datatype: string; layout: string; sampleRate: number; centerFrequency: number | null; samples: number };
  probes: ResultProbe[];
  timing?: { seconds: number; inputSamplesPerSecond: number | null };
}

/** A run as GET /api/runs and GET /api/runs/:id present it. */
export type Run = Omit<PresentedRun, 'results'> & { results?: RunResults };

/** One page of GET /api/runs. */
export interface RunList {
  runs: Run[];
  total: number;
  page: number;
  pageSize: number;
}

/** The answer of POST /api/runs and of a retry. */
export interface SubmittedRuns {
  runs: { id: string; status: RunStatus; fromCache: boolean }[];
}

/** A `status` event of GET /api/runs/:id/events. */
export interface RunStatusEvent {
  status: RunStatus;
  progress: number;
  currentStage: string | null;
  etaSeconds: number | null;
}

/** Kinds of plot data GET /api/runs/:id/plot reduces. */
export type PlotKind = 'spectrum' | 'spectrogram' | 'trace' | 'constellation';

interface PlotBase {
  probe: string;
  stageKind: string;
  kind: PlotKind;
  format: StreamFormat;
  /** Most points per row the server sent (the width asked for, px). */
  width: number;
}

/** A spectrum reduced to the plot's width (max per column). Frequencies in Hz from the stream's 0 Hz. */
export interface SpectrumPlotData extends PlotBase {
  kind: 'spectrum';
  unit: string;
  peak: { frequency: number; level: number | null };
  resolutionBandwidth: number;
  segments: number;
  frequencies: number[];
  levels: (number | null)[];
}

/** A spectrogram reduced across frequency; `levels[row][column]`, row start times in s. */
export interface SpectrogramPlotData extends PlotBase {
  kind: 'spectrogram';
  times: number[];
  frequencies: number[];
  levels: (number | null)[][];
  unit: string;
}

/** Min/max per column of each channel ([I, Q] for complex, [x] for real). */
export interface TracePlotData extends PlotBase {
  kind: 'trace';
  sampleRate: number;
  samplesPerColumn: number;
  channels: { min: number[]; max: number[] }[];
}

/** An evenly spaced subset of complex samples, interleaved I, Q. */
export interface ConstellationPlotData extends PlotBase {
  kind: 'constellation';
  points: number[];
}

export interface PlotDataByKind {
  spectrum: SpectrumPlotData;
  spectrogram: SpectrogramPlotData;
  trace: TracePlotData;
  constellation: ConstellationPlotData;
}

/** GET /api/runs/compare. */
export interface RunComparison {
  runs: Run[];
  spectra: ComparedSpectrum[];
  readouts: ComparedReadout[];
}

/** Statuses that still change. */
export const activeStatuses: ReadonlySet<RunStatus> = new Set(['queued', 'running']);

/** True while the run may still change (queued or running). */
export function isActive(status: RunStatus): boolean {
  return activeStatuses.has(status);
}
