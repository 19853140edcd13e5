/**
 * Exports of a run's results as files: CSV of one spectrum (frequency_hz, level_<unit>) and CSV of
 * every readout (probe, name, value, unit). Pure functions of the stored summary and
 * spectrum, so they are tested without a server.
 */
import { badRequest } from '../api/errors';
import type { RunSummary, SpectrumPlotData, TestPoint } from '@/contracts/run-results';

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

/** The test point `probeId` with a spectrum, or the first one; 400 naming `probe` when there is none. */
export function spectrumProbe(summary: RunSummary, probeId?: string): TestPoint {
  const withSpectrum = summary.testPoints.filter((point) => point.spectrum);
  const found = probeId ? withSpectrum.find((point) => point.stageId === probeId) : withSpectrum[0];
  if (!found) {
    const names = withSpectrum.map((point) => point.stageId).join(', ') || 'none';
    throw badRequest('no_spectrum', probeId ? `Probe "${probeId}" has no spectrum (spectra: ${names}).` : 'This run has no spectrum.', 'probe');
  }
  return found;
}

/** CSV of one spectrum (every bin): frequency in Hz (relative to the probed stream's 0 Hz) and level in the spectrum's unit. */
export function spectrumCsv(spectrum: Pick<SpectrumPlotData, 'frequencies' | 'levels' | 'unit'>): string {
  const { frequencies, levels, unit } = spectrum;
  const lines: (string | number | null)[][] = [['frequency_hz', levelColumn(unit)]];
  for (let i = 0; i < frequencies.length; i++) lines.push([frequencies[i]!, levels[i] ?? null]);
  return rows(lines);
}

/** CSV of every readout of every test point, in chain order. */
export function readoutsCsv(summary: Pick<RunSummary, 'testPoints'>): string {
  const lines: (string | number | null)[][] = [['probe', 'name', 'value', 'unit', 'flags', 'reason', 'definition']];
  for (const point of summary.testPoints) {
    for (const r of point.readouts) lines.push([point.stageId, r.name, r.value, r.unit, (r.flags ?? []).join(' '), r.reason ?? '', r.definition ?? '']);
  }
  return rows(lines);
}
