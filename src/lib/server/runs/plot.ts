/**
 * Plot data reduced for the screen: never more points than the plot is wide. Spectra keep the
 * highest level per column (narrow peaks survive at their true frequency), traces keep min and max
 * per column, spectrograms keep the highest level per column of each row, constellations keep an
 * evenly spaced subset of points. Each reduction applied to an already reduced plot keeps the same
 * guarantees, so a stored preview can be reduced again to any smaller width.
 */
import { reduceSpectrumMax } from '@/dsp/spectral';
import type { PlotData, PlotKind, ResultProbe } from '@/contracts/run-results';
import { badRequest } from '../api/errors';

export { plotKinds, type PlotKind } from '@/contracts/run-results';

/** Null levels (the engine's -Infinity) become -Infinity for comparisons and null again on the way out. */
function levelsIn(levels: (number | null)[]): number[] {
  return levels.map((level) => (level === null ? -Infinity : level));
}

function levelsOut(levels: number[]): (number | null)[] {
  return levels.map((level) => (Number.isFinite(level) ? level : null));
}

/** A spectrum reduced to at most `width` points (max per column). */
export function reduceSpectrum(frequencies: number[], levels: (number | null)[], width: number): { frequencies: number[]; levels: (number | null)[] } {
  if (frequencies.length <= width) return { frequencies, levels };
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

function reduceSpectrogram(frequencyList: number[], rows: (number | null)[][], width: number): { frequencies: number[]; levels: (number | null)[][] } {
  const bins = frequencyList.length;
  const group = Math.max(1, Math.ceil(bins / width));
  if (group === 1) return { frequencies: frequencyList, levels: rows };
  const frequencies: number[] = [];
  for (let start = 0; start < bins; start += group) {
    const end = Math.min(bins, start + group);
    // Column centre: the mean frequency of the bins it holds (Hz).
    frequencies.push((frequencyList[start]! + frequencyList[end - 1]!) / 2);
  }
  const levels = rows.map((row) => {
    const out: (number | null)[] = [];
    for (let start = 0; start < bins; start += group) {
      let hi = -Infinity;
      for (let j = start; j < Math.min(bins, start + group); j++) {
        const level = row[j] ?? null;
        if (level !== null && level > hi) hi = level;
      }
      out.push(Number.isFinite(hi) ? hi : null);
    }
    return out;
  });
  return { frequencies, levels };
}

/** The width rule of the plot endpoint: 400 naming `width` outside 2..10000 px. */
export function assertPlotWidth(width: number): void {
  if (!Number.isInteger(width) || width < 2 || width > 10_000) throw badRequest('invalid_field', 'width must be a whole number of pixels from 2 to 10000.', 'width');
}

/** `plot` with at most `width` points per row (for a constellation: at most `width` points). */
export function reducePlot(plot: PlotData, width: number): PlotData {
  switch (plot.kind) {
    case 'spectrum':
      return { ...plot, width, ...reduceSpectrum(plot.frequencies, plot.levels, width) };
    case 'spectrogram':
      return { ...plot, width, ...reduceSpectrogram(plot.frequencies, plot.levels, width) };
    case 'trace': {
      const channels = plot.channels.map((channel) => mergeMinMax(channel.min, channel.max, width));
      const group = channels[0]?.group ?? 1;
      return { ...plot, width, samplesPerColumn: plot.samplesPerColumn * group, channels: channels.map(({ min, max }) => ({ min, max })) };
    }
    case 'constellation': {
      const points = plot.points.length / 2;
      const step = Math.max(1, Math.ceil(points / width));
      if (step === 1) return { ...plot, width };
      const out: number[] = [];
      for (let p = 0; p < points; p += step) out.push(plot.points[2 * p]!, plot.points[2 * p + 1]!);
      return { ...plot, width, points: out };
    }
  }
}

/** The plot kinds a probe has data for, in the order the run page shows them. */
export function probePlotKinds(probe: ResultProbe): PlotKind[] {
  const kinds: PlotKind[] = [];
  if (probe.spectrum) kinds.push('spectrum');
  if (probe.spectrogram) kinds.push('spectrogram');
  if (probe.trace) kinds.push('trace');
  if (probe.constellation && probe.constellation.length > 0) kinds.push('constellation');
  return kinds;
}

/** The full-resolution plot data of one probe and kind, or null when the probe has none. */
export function fullPlot(probe: ResultProbe, kind: PlotKind): PlotData | null {
  const base = { probe: probe.stageId, stageKind: probe.kind, format: probe.format };
  if (kind === 'spectrum' && probe.spectrum) {
    const s = probe.spectrum;
    return { ...base, kind, width: s.frequencies.length, bins: s.frequencies.length, unit: s.unit, peak: s.peak, resolutionBandwidth: s.resolutionBandwidth, segments: s.segments, frequencies: s.frequencies, levels: s.levels };
  }
  if (kind === 'spectrogram' && probe.spectrogram) {
    const g = probe.spectrogram;
    return { ...base, kind, width: g.frequencies.length, times: g.times, frequencies: g.frequencies, levels: g.levels, unit: g.unit };
  }
  if (kind === 'trace' && probe.trace) {
    const t = probe.trace;
    return { ...base, kind, width: t.channels[0]?.min.length ?? 0, sampleRate: t.sampleRate, samplesPerColumn: t.samplesPerColumn, channels: t.channels };
  }
  if (kind === 'constellation' && probe.constellation && probe.constellation.length > 0) {
    return { ...base, kind, width: probe.constellation.length / 2, points: probe.constellation };
  }
  return null;
}
