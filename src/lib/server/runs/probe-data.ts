/**
 * A succeeded run's results cut up for serving: a summary (readouts, issues, timing, test points
 * and the plot kinds each has) and, per probe and plot kind, its full data and a preview already
 * reduced to PREVIEW_WIDTH points per row. The worker computes them, so answering a run page never
 * parses or reduces a whole results document on the web thread; each plot request reads one
 * preview row.
 */
import type { PlotKind, RunResults, RunSummary, TestPoint } from '@/contracts/run-results';
import { finiteJsonNumbers } from '@/dsp/chain/results';
import { fullPlot, probePlotKinds, reducePlot } from './plot';

/** Points per row a stored preview keeps (px): wider than any plot the pages draw. */
export const PREVIEW_WIDTH = 4096;
/** Points a stored constellation preview keeps: the most the run page asks for. */
export const PREVIEW_POINTS = 10_000;

/** One row of run_probe_data, as the worker hands it over (JSON texts). */
export interface ProbeDataEntry {
  stageId: string;
  kind: PlotKind;
  /** The probe's full data of this kind (PlotData JSON). */
  data: string;
  /** The same reduced to PREVIEW_WIDTH (PlotData JSON). */
  preview: string;
}

/** Median of the finite levels: the noise floor of a spectrum that is mostly noise bins. */
export function medianLevel(levels: (number | null)[]): number | null {
  const finite = levels.filter((level): level is number => level !== null && Number.isFinite(level)).sort((x, y) => x - y);
  if (finite.length === 0) return null;
  const middle = finite.length >> 1;
  return finite.length % 2 === 1 ? finite[middle]! : (finite[middle - 1]! + finite[middle]!) / 2;
}

/** What GET /api/runs/:id sends of `results`: everything but the plot data. */
export function summarizeResults(results: RunResults): RunSummary {
  const testPoints: TestPoint[] = results.probes.map((probe) => {
    const point: TestPoint = { stageId: probe.stageId, kind: probe.kind, format: probe.format, plots: probePlotKinds(probe), readouts: probe.readouts ?? [] };
    if (probe.spectrum) {
      const s = probe.spectrum;
      point.spectrum = { unit: s.unit, peak: s.peak, resolutionBandwidth: s.resolutionBandwidth, segments: s.segments, bins: s.frequencies.length, noiseFloor: medianLevel(s.levels) };
    }
    return point;
  });
  return { engineVersion: results.engineVersion, input: results.input, output: results.output, issues: results.issues, timing: results.timing, testPoints };
}

/** Each probe's data per plot kind with its stored preview. */
export function probeDataEntries(results: RunResults): ProbeDataEntry[] {
  const entries: ProbeDataEntry[] = [];
  for (const probe of results.probes) {
    for (const kind of probePlotKinds(probe)) {
      const full = fullPlot(probe, kind)!;
      const preview = reducePlot(full, kind === 'constellation' ? PREVIEW_POINTS : PREVIEW_WIDTH);
      entries.push({ stageId: probe.stageId, kind, data: JSON.stringify(full, finiteJsonNumbers), preview: JSON.stringify(preview, finiteJsonNumbers) });
    }
  }
  return entries;
}
