/**
 * A run's results (the `results.json` document): what a run read, what it produced, and every probe
 * with its stage id and kind. Declared once here, because the engine builds it; the command line,
 * the server's workers and the run pages all take it from this schema (re-exported by
 * src/contracts/run-results.ts). Frequencies are in Hz relative to the probed stream's 0 Hz;
 * levels in the spectrum's unit. JSON has no -Infinity or NaN: such levels are null.
 */
import { z } from 'zod';
import { READOUT_FLAGS, type ChainIssue, type ProbeOutput, type Readout, type StreamFormat } from '../types';
import type { ChainDocument } from './document';

/** Level in a spectrum's unit, or null where the engine had -Infinity or NaN. */
const level = z.number().nullable();

export const streamFormatSchema = z.object({
  sampleRate: z.number(),
  sampleType: z.enum(['real', 'complex', 'real-pair']),
  centerFrequency: z.number().optional(),
  spectrumInverted: z.boolean().optional(),
  bandLimit: z.number().optional(),
});

export const chainIssueSchema = z.object({
  severity: z.enum(['warning', 'error']),
  code: z.string(),
  message: z.string(),
  stageId: z.string().optional(),
  field: z.string().optional(),
});

export const spectrumUnitSchema = z.enum(['dBFS/Hz', 'dBFS', 'dBm/Hz', 'dBm']);

/**
 * One readout: a value, or null with the reason it could not be computed; flags state caveats on a
 * computed value; definition names the published definition used (the README's readouts table).
 */
export const resultReadoutSchema = z.object({
  name: z.string(),
  value: level,
  unit: z.string(),
  reason: z.string().optional(),
  flags: z.array(z.enum(READOUT_FLAGS)).optional(),
  definition: z.string().optional(),
});

export const resultSpectrumSchema = z.object({
  unit: spectrumUnitSchema,
  peak: z.object({ frequency: z.number(), level }),
  resolutionBandwidth: z.number(),
  segments: z.number(),
  frequencies: z.array(z.number()),
  levels: z.array(level),
});

export const resultSpectrogramSchema = z.object({
  times: z.array(z.number()),
  frequencies: z.array(z.number()),
  levels: z.array(z.array(level)),
  unit: spectrumUnitSchema,
});

export const resultTraceSchema = z.object({
  sampleRate: z.number(),
  samplesPerColumn: z.number(),
  channels: z.array(z.object({ min: z.array(z.number()), max: z.array(z.number()) })),
});

export const resultProbeSchema = z.object({
  stageId: z.string(),
  kind: z.string(),
  format: streamFormatSchema,
  spectrum: resultSpectrumSchema.optional(),
  readouts: z.array(resultReadoutSchema).optional(),
  spectrogram: resultSpectrogramSchema.optional(),
  trace: resultTraceSchema.optional(),
  /** Interleaved I, Q of evenly spread complex samples. */
  constellation: z.array(z.number()).optional(),
});

export const runResultsSchema = z.object({
  engineVersion: z.string(),
  createdAt: z.string(),
  chain: z.object({
    path: z.string(),
    name: z.string(),
    stages: z.array(z.object({ id: z.string(), kind: z.string(), probe: z.boolean().optional(), bypass: z.boolean().optional() })),
  }),
  input: z.object({
    path: z.string(),
    container: z.string(),
    datatype: z.string(),
    layout: z.string(),
    sampleRate: z.number(),
    centerFrequency: z.number().nullable(),
    samples: z.number(),
    durationSeconds: z.number(),
  }),
  output: z.object({
    meta: z.string(),
    data: z.string(),
    datatype: z.string(),
    layout: z.string(),
    sampleRate: z.number(),
    centerFrequency: z.number().nullable(),
    samples: z.number(),
  }),
  probes: z.array(resultProbeSchema),
  issues: z.array(chainIssueSchema),
  /** Run time (s) and input samples per second (null for a run too short to time). */
  timing: z.object({ seconds: z.number(), inputSamplesPerSecond: z.number().nullable() }),
});

export type ResultReadout = z.infer<typeof resultReadoutSchema>;
export type ResultSpectrum = z.infer<typeof resultSpectrumSchema>;
export type ResultSpectrogram = z.infer<typeof resultSpectrogramSchema>;
export type ResultTrace = z.infer<typeof resultTraceSchema>;
export type ResultProbe = z.infer<typeof resultProbeSchema>;
export type RunResults = z.infer<typeof runResultsSchema>;

/** What a chain run gives the results (ChainRunResult carries these). */
export interface RunFigures {
  probes: ProbeOutput[];
  outputFormat: StreamFormat;
  samplesIn: number;
  samplesOut: number;
  issues: ChainIssue[];
}

/** The capture the results describe: where it came from, its container and datatype, its format. */
export interface ResultsInput {
  path: string;
  /** Container, e.g. `sigmf`, `wav`, `raw`. */
  kind: string;
  datatypeLabel: string;
  format: StreamFormat;
}

function finiteOrNull(value: number | null): number | null {
  return value !== null && Number.isFinite(value) ? value : null;
}

/** A readout as results.json holds it: optional facts only when present. */
function readoutJson(r: Readout): z.infer<typeof resultReadoutSchema> {
  const value = finiteOrNull(r.value);
  const out: z.infer<typeof resultReadoutSchema> = { name: r.name, value, unit: r.unit };
  // A value the engine reported but JSON cannot hold still needs a reason beside its null.
  const reason = r.reason ?? (value === null && r.value !== null ? 'the value is not a finite number' : undefined);
  if (reason) out.reason = reason;
  if (r.flags && r.flags.length > 0) out.flags = [...r.flags];
  if (r.definition) out.definition = r.definition;
  return out;
}

function probeResults(probe: ProbeOutput): ResultProbe {
  const out: ResultProbe = { stageId: probe.stageId, kind: probe.kind, format: probe.format };
  if (probe.spectrum) {
    const s = probe.spectrum;
    out.spectrum = {
      unit: s.unit,
      peak: { frequency: s.peak.frequency, level: finiteOrNull(s.peak.level) },
      resolutionBandwidth: s.resolutionBandwidth,
      segments: s.segments,
      frequencies: s.frequencies,
      levels: s.levels.map(finiteOrNull),
    };
  }
  if (probe.readouts) out.readouts = probe.readouts.map(readoutJson);
  if (probe.spectrogram) {
    const g = probe.spectrogram;
    out.spectrogram = { times: g.times, frequencies: g.frequencies, levels: g.levels.map((row) => row.map(finiteOrNull)), unit: g.unit };
  }
  if (probe.trace) out.trace = probe.trace;
  if (probe.constellation) out.constellation = probe.constellation;
  return out;
}

/** The results document of one run; `seconds` is its run time (s). */
export function buildResults(args: {
  engineVersion: string;
  chainPath: string;
  doc: ChainDocument;
  capture: ResultsInput;
  run: RunFigures;
  outputDatatype: string;
  seconds: number;
  /** Defaults to now. */
  createdAt?: Date;
}): RunResults {
  const { capture, run, doc } = args;
  return {
    engineVersion: args.engineVersion,
    createdAt: (args.createdAt ?? new Date()).toISOString(),
    chain: {
      path: args.chainPath,
      name: doc.name,
      stages: doc.stages.map((s) => ({ id: s.id, kind: s.kind, probe: s.probe, bypass: s.bypass })),
    },
    input: {
      path: capture.path,
      container: capture.kind,
      datatype: capture.datatypeLabel,
      layout: capture.format.sampleType,
      sampleRate: capture.format.sampleRate,
      centerFrequency: capture.format.centerFrequency ?? null,
      samples: run.samplesIn,
      durationSeconds: run.samplesIn / capture.format.sampleRate,
    },
    output: {
      meta: 'output.sigmf-meta',
      data: 'output.sigmf-data',
      datatype: args.outputDatatype,
      layout: run.outputFormat.sampleType,
      sampleRate: run.outputFormat.sampleRate,
      centerFrequency: run.outputFormat.centerFrequency ?? null,
      samples: run.samplesOut,
    },
    probes: run.probes.map(probeResults),
    issues: run.issues,
    timing: { seconds: args.seconds, inputSamplesPerSecond: args.seconds > 0 ? run.samplesIn / args.seconds : null },
  };
}

/** JSON has no NaN or Infinity: any left in traces or timings are written as null, as results.json always did. */
export function finiteJsonNumbers(_key: string, value: unknown): unknown {
  return typeof value === 'number' && !Number.isFinite(value) ? null : value;
}
