/**
 * Plot data reduced for the screen: never more points than the plot is wide. Spectra keep the
 * highest level per column (narrow peaks survive at their true frequency), traces keep min and max
 * per column, spectrograms keep the highest level per column of each row, constellations keep an
 * evenly spaced subset of points.
 */
import { reduceSpectrumMax } from '@/dsp/spectral';
import { badRequest, notFound, ApiError } from '../api/errors';
import type { ResultProbe, RunResults } from './results';

export const plotKinds = ['spectrum', 'spectrogram', 'trace', 'constellation'] as const;
export type PlotKind = (typeof plotKinds)[number];

/** Null levels (the engine's -Infinity) become -Infinity for comparisons and null again on the way out. */
function levelsIn(levels: (number | null)[]): number[] {
  return levels.map((level) => (level === null ? -Infinity : level));
}

function levelsOut(levels: number[]): (number | null)[] {
  return levels.map((level) => (Number.isFinite(level) ? level : null));
}

/** A spectrum reduced to at most `width` points (max per column). */
export function reduceSpectrum(frequencies: number[], levels: (number | null)[], width: number): { frequencies: number[]; levels: (number | null)[] } {
  const reduced = reduceSpectrumMax(frequencies, levelsIn(levels), width);
  return { frequencies: reduced.frequencies, levels: levelsOut(reduced.levels) };
}

/** Min/max columns merged into at most `width` columns (min of mins, max of maxes). */
export function mergeMinMax(min: number[], max: number[], width: number): { group: number; min: number[]; max: number[] } {
  const group = Math.max(1, Math.ceil(min.length / width));
  const outMin: number[] = [];
  const outMax: number[] = [];
  for (let start = 0; start < min.length; start += group) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let j = start; j < Math.min(min.length, start + group); j++) {
      if (min[j]! < lo) lo = min[j]!;
      if (max[j]! > hi) hi = max[j]!;
    }
    outMin.push(lo);
    outMax.push(hi);
  }
  return { group, min: outMin, max: outMax };
}

function reduceSpectrogram(spectrogram: NonNullable<ResultProbe['spectrogram']>, width: number) {
  const bins = spectrogram.frequencies.length;
  const group = Math.max(1, Math.ceil(bins / width));
  const frequencies: number[] = [];
  for (let start = 0; start < bins; start += group) {
    const end = Math.min(bins, start + group);
    // Column centre: the mean frequency of the bins it holds (Hz).
    frequencies.push((spectrogram.frequencies[start]! + spectrogram.frequencies[end - 1]!) / 2);
  }
  const levels = spectrogram.levels.map((row) => {
    const out: (number | null)[] = [];
    for (let start = 0; start < bins; start += group) {
      let hi = -Infinity;
      for (let j = start; j < Math.min(bins, start + group); j++) {
        const level = row[j] ?? -Infinity;
        if (level !== null && level > hi) hi = level;
      }
      out.push(Number.isFinite(hi) ? hi : null);
    }
    return out;
  });
  return { times: spectrogram.times, frequencies, levels, unit: spectrogram.unit };
}

/** The plot data of one probe and kind, reduced to at most `width` points per row. */
export function plotData(results: RunResults, probeId: string, kind: PlotKind, width: number): Record<string, unknown> {
  if (!Number.isInteger(width) || width < 2 || width > 10_000) throw badRequest('invalid_field', 'width must be a whole number of pixels from 2 to 10000.', 'width');
  const probe = results.probes.find((candidate) => candidate.stageId === probeId);
  if (!probe) throw new ApiError(404, 'not_found', `No probe "${probeId}" in this run.`, 'probe');
  const base = { probe: probe.stageId, stageKind: probe.kind, kind, format: probe.format, width };
  if (kind === 'spectrum' && probe.spectrum) {
    const { unit, peak, resolutionBandwidth, segments } = probe.spectrum;
    return { ...base, unit, peak, resolutionBandwidth, segments, ...reduceSpectrum(probe.spectrum.frequencies, probe.spectrum.levels, width) };
  }
  if (kind === 'spectrogram' && probe.spectrogram) return { ...base, ...reduceSpectrogram(probe.spectrogram, width) };
  if (kind === 'trace' && probe.trace) {
    const channels = probe.trace.channels.map((channel) => mergeMinMax(channel.min, channel.max, width));
    const group = channels[0]?.group ?? 1;
    return {
      ...base,
      sampleRate: probe.trace.sampleRate,
      samplesPerColumn: probe.trace.samplesPerColumn * group,
      channels: channels.map(({ min, max }) => ({ min, max })),
    };
  }
  if (kind === 'constellation' && probe.constellation) {
    const points = probe.constellation.length / 2;
    const step = Math.max(1, Math.ceil(points / width));
    const out: number[] = [];
    for (let p = 0; p < points; p += step) out.push(probe.constellation[2 * p]!, probe.constellation[2 * p + 1]!);
    return { ...base, points: out };
  }
  throw notFound(`${kind} for probe "${probeId}"`);
}
