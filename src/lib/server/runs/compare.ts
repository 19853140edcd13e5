/**
 * Comparing runs (the same chain on captures of two board revisions, say): every spectrum of every
 * run, reduced for the plot, and every readout side by side with its difference from the first
 * run that has it. Works on stored summaries and spectrum previews, read in one query each.
 */
import type { Knex } from 'knex';
import type { RunSummary, SpectrumPlotData } from '@/contracts/run-results';
import type { ComparedReadout, ComparedSpectrum } from '@/contracts/run';
import { reduceSpectrum } from './plot';
import { spectrumPreviewsOf, summariesOf } from './results';
import type { RunView } from './rows';

export type { ComparedReadout, ComparedSpectrum } from '@/contracts/run';

/** One compared run: its summary and its spectra (stored previews). */
export interface ComparedRunData {
  runId: string;
  summary: RunSummary;
  spectra: SpectrumPlotData[];
}

/** Summaries and spectrum previews of the succeeded runs among `runs`, in their order, with two queries in all. */
export async function loadComparedRuns(db: Knex, runs: RunView[]): Promise<ComparedRunData[]> {
  const succeeded = runs.filter((run) => run.status === 'succeeded' && run.result_id);
  const resultIds = succeeded.map((run) => run.result_id!);
  const [summaries, spectra] = await Promise.all([summariesOf(db, resultIds), spectrumPreviewsOf(db, resultIds)]);
  const compared: ComparedRunData[] = [];
  for (const run of succeeded) {
    const summary = summaries.get(run.result_id!);
    if (!summary) continue;
    const byProbe = new Map((spectra.get(run.result_id!) ?? []).map((spectrum) => [spectrum.probe, spectrum]));
    // Chain order, as the summary lists the test points.
    const ordered = summary.testPoints.map((point) => byProbe.get(point.stageId)).filter((s): s is SpectrumPlotData => s !== undefined);
    compared.push({ runId: run.id, summary, spectra: ordered });
  }
  return compared;
}

/** Spectra and readouts of succeeded runs, in request order; `width` bounds points per spectrum. */
export function compareResults(runs: ComparedRunData[], width: number): { spectra: ComparedSpectrum[]; readouts: ComparedReadout[] } {
  const spectra: ComparedSpectrum[] = [];
  const readouts = new Map<string, ComparedReadout>();
  for (const { runId, summary, spectra: runSpectra } of runs) {
    for (const spectrum of runSpectra) {
      spectra.push({ runId, probe: spectrum.probe, unit: spectrum.unit, ...reduceSpectrum(spectrum.frequencies, spectrum.levels, width) });
    }
    for (const point of summary.testPoints) {
      for (const readout of point.readouts) {
        const key = JSON.stringify([point.stageId, readout.name, readout.unit]);
        let entry = readouts.get(key);
        if (!entry) {
          entry = { probe: point.stageId, name: readout.name, unit: readout.unit, values: {}, baseline: null, differences: {} };
          readouts.set(key, entry);
        }
        entry.values[runId] = readout.value;
        if (readout.value === null && readout.reason) entry.reasons = { ...entry.reasons, [runId]: readout.reason };
      }
    }
  }
  for (const entry of readouts.values()) {
    const baselineRun = runs.find(({ runId }) => typeof entry.values[runId] === 'number');
    entry.baseline = baselineRun?.runId ?? null;
    const base = baselineRun ? (entry.values[baselineRun.runId] as number) : null;
    for (const [runId, value] of Object.entries(entry.values)) {
      entry.differences[runId] = base !== null && typeof value === 'number' ? value - base : null;
    }
  }
  return { spectra, readouts: [...readouts.values()] };
}
