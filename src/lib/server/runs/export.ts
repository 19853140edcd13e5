/**
 * Exports of a run's results as files: CSV of one spectrum (frequency_hz, level_<unit>) and CSV of
 * every readout (probe, name, value, unit). Pure functions of results.json, so they are tested
 * without a server.
 */
import { badRequest } from '../api/errors';
import type { ResultProbe, RunResults } from './results';

/** A CSV cell: quoted when it holds a comma, quote or line break (RFC 4180). */
function cell(value: string | number | null): string {
  if (value === null) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function rows(lines: (string | number | null)[][]): string {
  return lines.map((line) => line.map(cell).join(',')).join('\r\n') + '\r\n';
}

/** Column name of a level unit: `dBFS/Hz` becomes `level_dBFS_per_Hz`. */
export function levelColumn(unit: string): string {
  return `level_${unit.replace(/\//g, '_per_').replace(/[^A-Za-z0-9_]/g, '_')}`;
}

/** The spectrum probe `probeId`, or the first probe with a spectrum; 400 naming `probe` when there is none. */
export function spectrumProbe(results: RunResults, probeId?: string): ResultProbe & { spectrum: NonNullable<ResultProbe['spectrum']> } {
  const withSpectrum = results.probes.filter((probe) => probe.spectrum);
  const found = probeId ? withSpectrum.find((probe) => probe.stageId === probeId) : withSpectrum[0];
  if (!found) {
    const names = withSpectrum.map((probe) => probe.stageId).join(', ') || 'none';
    throw badRequest('no_spectrum', probeId ? `Probe "${probeId}" has no spectrum (spectra: ${names}).` : 'This run has no spectrum.', 'probe');
  }
  return found as ResultProbe & { spectrum: NonNullable<ResultProbe['spectrum']> };
}

/** CSV of one spectrum: frequency in Hz (relative to the probed stream's 0 Hz) and level in the spectrum's unit. */
export function spectrumCsv(results: RunResults, probeId?: string): { probe: string; csv: string } {
  const probe = spectrumProbe(results, probeId);
  const { frequencies, levels, unit } = probe.spectrum;
  const lines: (string | number | null)[][] = [['frequency_hz', levelColumn(unit)]];
  for (let i = 0; i < frequencies.length; i++) lines.push([frequencies[i]!, levels[i] ?? null]);
  return { probe: probe.stageId, csv: rows(lines) };
}

/** CSV of every readout of every probe, in chain order. */
export function readoutsCsv(results: RunResults): string {
  const lines: (string | number | null)[][] = [['probe', 'name', 'value', 'unit']];
  for (const probe of results.probes) {
    for (const readout of probe.readouts ?? []) lines.push([probe.stageId, readout.name, readout.value, readout.unit]);
  }
  return rows(lines);
}
