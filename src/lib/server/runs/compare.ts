/**
 * Comparing runs (the same chain on captures of two board revisions, say): every spectrum of every
 * run, reduced for the plot, and every readout side by side with its difference from the first
 * run that has it.
 */
import { reduceSpectrum } from './plot';
import type { RunResults } from './results';

export interface ComparedSpectrum {
  runId: string;
  probe: string;
  unit: string;
  /** Hz, relative to the probed stream's 0 Hz. */
  frequencies: number[];
  levels: (number | null)[];
}

export interface ComparedReadout {
  probe: string;
  name: string;
  unit: string;
  /** Value per run id (runs without this readout are absent). */
  values: Record<string, number | null>;
  /** The run the differences are taken against: the first run (in request order) with a value. */
  baseline: string | null;
  /** value - baseline value per run id, in the readout's unit (dB for levels). */
  differences: Record<string, number | null>;
}

/** Spectra and readouts of succeeded runs, in request order; `width` bounds points per spectrum. */
export function compareResults(runs: { runId: string; results: RunResults }[], width: number): { spectra: ComparedSpectrum[]; readouts: ComparedReadout[] } {
  const spectra: ComparedSpectrum[] = [];
  const readouts = new Map<string, ComparedReadout>();
  for (const { runId, results } of runs) {
    for (const probe of results.probes) {
      if (probe.spectrum) {
        spectra.push({ runId, probe: probe.stageId, unit: probe.spectrum.unit, ...reduceSpectrum(probe.spectrum.frequencies, probe.spectrum.levels, width) });
      }
      for (const readout of probe.readouts ?? []) {
        const key = JSON.stringify([probe.stageId, readout.name, readout.unit]);
        let entry = readouts.get(key);
        if (!entry) {
          entry = { probe: probe.stageId, name: readout.name, unit: readout.unit, values: {}, baseline: null, differences: {} };
          readouts.set(key, entry);
        }
        entry.values[runId] = readout.value;
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
