/**
 * A run's results and what the run pages get of them. The results document itself (results.json)
 * is built by the engine, so its schema lives in src/dsp/chain/results.ts and is re-exported here;
 * this file adds the summary a run page reads first (readouts, issues, timing and the test points
 * with the plot kinds each has) and the reduced plot data of each kind.
 */
import { z } from 'zod';
import { resultReadoutSchema, resultSpectrumSchema, runResultsSchema, spectrumUnitSchema, streamFormatSchema } from '@/dsp/chain/results';

export {
  chainIssueSchema,
  resultProbeSchema,
  resultReadoutSchema,
  resultSpectrumSchema,
  runResultsSchema,
  spectrumUnitSchema,
  streamFormatSchema,
} from '@/dsp/chain/results';
export type { ResultProbe, ResultReadout, ResultSpectrum, ResultSpectrogram, ResultTrace, RunResults } from '@/dsp/chain/results';

export const plotKinds = ['spectrum', 'spectrogram', 'trace', 'constellation'] as const;
export const plotKindSchema = z.enum(plotKinds);
export type PlotKind = z.infer<typeof plotKindSchema>;

/** One test point (a probed stage): its readouts and which plots it has. */
export const testPointSchema = z.object({
  stageId: z.string(),
  /** The stage's kind. */
  kind: z.string(),
  format: streamFormatSchema,
  plots: z.array(plotKindSchema),
  readouts: z.array(resultReadoutSchema),
  /** The spectrum's figures without its bins; `bins` counts them, `noiseFloor` is their median level. */
  spectrum: resultSpectrumSchema
    .pick({ unit: true, peak: true, resolutionBandwidth: true, segments: true })
    .extend({ bins: z.number().int(), noiseFloor: z.number().nullable() })
    .optional(),
});
export type TestPoint = z.infer<typeof testPointSchema>;

/** What GET /api/runs/:id sends of a succeeded run: everything but the plot data. */
export const runSummarySchema = runResultsSchema.pick({ engineVersion: true, input: true, output: true, issues: true, timing: true }).extend({
  testPoints: z.array(testPointSchema),
});
export type RunSummary = z.infer<typeof runSummarySchema>;

const plotBase = z.object({
  probe: z.string(),
  stageKind: z.string(),
  format: streamFormatSchema,
  /** Most points per row the server sent (the width asked for, px). */
  width: z.number().int(),
});

/** A spectrum reduced to the plot's width (max per column); `bins` counts the full spectrum's bins. */
export const spectrumPlotSchema = plotBase.extend({
  kind: z.literal('spectrum'),
  unit: spectrumUnitSchema,
  peak: z.object({ frequency: z.number(), level: z.number().nullable() }),
  resolutionBandwidth: z.number(),
  segments: z.number(),
  bins: z.number().int(),
  frequencies: z.array(z.number()),
  levels: z.array(z.number().nullable()),
});

/** A spectrogram reduced across frequency; `levels[row][column]`, row start times in s. */
export const spectrogramPlotSchema = plotBase.extend({
  kind: z.literal('spectrogram'),
  times: z.array(z.number()),
  frequencies: z.array(z.number()),
  levels: z.array(z.array(z.number().nullable())),
  unit: spectrumUnitSchema,
});

/** Min/max per column of each channel ([I, Q] for complex, [x] for real). */
export const tracePlotSchema = plotBase.extend({
  kind: z.literal('trace'),
  sampleRate: z.number(),
  samplesPerColumn: z.number(),
  channels: z.array(z.object({ min: z.array(z.number()), max: z.array(z.number()) })),
});

/** An evenly spaced subset of complex samples, interleaved I, Q. */
export const constellationPlotSchema = plotBase.extend({
  kind: z.literal('constellation'),
  points: z.array(z.number()),
});

export const plotDataSchema = z.discriminatedUnion('kind', [spectrumPlotSchema, spectrogramPlotSchema, tracePlotSchema, constellationPlotSchema]);

export type SpectrumPlotData = z.infer<typeof spectrumPlotSchema>;
export type SpectrogramPlotData = z.infer<typeof spectrogramPlotSchema>;
export type TracePlotData = z.infer<typeof tracePlotSchema>;
export type ConstellationPlotData = z.infer<typeof constellationPlotSchema>;
export type PlotData = z.infer<typeof plotDataSchema>;
export interface PlotDataByKind {
  spectrum: SpectrumPlotData;
  spectrogram: SpectrogramPlotData;
  trace: TracePlotData;
  constellation: ConstellationPlotData;
}

/** Every bin of one probe's spectrum (for markers that snap to bins, and the CSV). */
export const spectrumBinsSchema = resultSpectrumSchema.extend({ probe: z.string() });
export type SpectrumBins = z.infer<typeof spectrumBinsSchema>;
