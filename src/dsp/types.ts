/**
 * Core types shared by every part of the DSP engine.
 *
 * Memory layout (who owns what, where samples sit):
 * - A block is a Float32Array. Full scale is 1.0.
 * - `real`: one value per sample.
 * - `complex`: interleaved I then Q, two values per sample (index 2n is I of sample n, 2n+1 is Q).
 * - `real-pair`: two real channels (channel 0 then channel 1, e.g. I and Q of a dual ADC)
 *   interleaved, two values per sample. Only `quadrature-combine` turns it into `complex`.
 * - A processor owns the arrays it returns until its next call; callers that keep a block longer
 *   copy it. A processor never keeps a reference to its input after `process` returns.
 *
 * This folder is pure TypeScript: no Node, Astro, database or DOM imports, so the browser, the
 * worker threads and the command line run the same code.
 */
import type { z } from 'zod';

/** How the values of a block make up samples. */
export type SampleType = 'real' | 'complex' | 'real-pair';

/** Values per sample for a sample type: 1 for real, 2 for complex and real-pair. */
export function valuesPerSample(type: SampleType): 1 | 2 {
  return type === 'real' ? 1 : 2;
}

/** What flows between two stages. */
export interface StreamFormat {
  /** Samples per second (Hz) of this stream. */
  sampleRate: number;
  sampleType: SampleType;
  /** RF frequency (Hz) that 0 Hz of this stream stands for; informational, may be absent. */
  centerFrequency?: number;
  /**
   * True when the spectrum is mirrored: a component at f of this stream stands for RF
   * centerFrequency - f instead of centerFrequency + f. Absent means upright.
   */
  spectrumInverted?: boolean;
  /**
   * Highest |frequency| (Hz) still present after a preceding band-limiting filter (its stop-band
   * edge). Absent when nothing has band-limited the stream since the last rate or frequency change;
   * decimation uses it to warn about aliasing.
   */
  bandLimit?: number;
}

/** A warning or error found before or during a run, tied to a stage and field where it can be. */
export interface ChainIssue {
  severity: 'warning' | 'error';
  /** Stable machine-readable id, e.g. `cutoff-above-nyquist`. */
  code: string;
  message: string;
  stageId?: string;
  /** Position of the stage in the document (0-based): the one reliable index, as ids may be missing or repeated. */
  stageIndex?: number;
  /** Parameter name (dot path for nested ones) the issue is about. */
  field?: string;
}

/** One measurement of a readout table. */
export interface Readout {
  name: string;
  /** A finite number, or null when it could not be computed (`reason` then says why); never +/-Infinity or NaN. */
  value: number | null;
  /** Unit as shown to people: `Hz`, `dB`, `dBFS`, `dBm`, `deg`, `%`, ... */
  unit: string;
  /** Why `value` is null, in words (e.g. "the capture holds no signal: every sample is 0"). */
  reason?: string;
  /** Caveats on a value that was computed: see READOUT_FLAGS. */
  flags?: ReadoutFlag[];
  /** Stable id of the definition used (e.g. `sinad-sine-fit`); the README's readouts table lists each with its source. */
  definition?: string;
}

/**
 * Caveats a readout may carry:
 * - `start-up-transient`: the capture is shorter than the FFT size, or a filter's start-up is a
 *   large part of it; the figure includes the transient.
 * - `holds-tone`: a DC readout whose lobe holds the strongest component (a tone mixed to 0 Hz).
 * - `window-limited`: the window's leakage or the FFT's resolution bounds the figure; the truth is
 *   better than the number.
 * - `tone-at-dc`: the tone sits in the 0 Hz lobe; tone readouts measured it there, DC included.
 * - `assumption-fails`: the estimator's assumption does not hold for this signal (e.g. blind I/Q
 *   imbalance with a tone at 0 Hz or fs/2); read the value as indicative only.
 * - `clipped`: samples reached full scale, so distortion figures include clipping.
 */
export const READOUT_FLAGS = ['start-up-transient', 'holds-tone', 'window-limited', 'tone-at-dc', 'assumption-fails', 'clipped'] as const;
export type ReadoutFlag = (typeof READOUT_FLAGS)[number];

/** A power spectrum ready to plot; 0 Hz centred for complex input (two-sided). */
export interface SpectrumResult {
  /** Frequency of each bin in Hz, relative to the stream's 0 Hz, ascending. */
  frequencies: number[];
  /** Level of each bin in `unit`. */
  levels: number[];
  unit: 'dBFS/Hz' | 'dBFS' | 'dBm/Hz' | 'dBm';
  /** Highest bin, interpolated: frequency in Hz, level in `unit`. */
  peak: { frequency: number; level: number };
  /** Resolution bandwidth in Hz (equivalent noise bandwidth of one bin). */
  resolutionBandwidth: number;
  /** Number of segments averaged. */
  segments: number;
}

/** A spectrogram image with a bounded size. `levels[row][column]`: row = time, column = frequency. */
export interface SpectrogramResult {
  /** Time of each row (s from the start of the stream): the centre of the samples the row covers. */
  times: number[];
  frequencies: number[];
  levels: number[][];
  unit: SpectrumResult['unit'];
}

/** A long trace reduced to min/max per column, for plotting without sending every sample. */
export interface TraceResult {
  sampleRate: number;
  /** Samples per column. */
  samplesPerColumn: number;
  /** One entry per channel: [I, Q] for complex, [x] for real, [ch0, ch1] for real-pair. */
  channels: { min: number[]; max: number[] }[];
}

/** What a probe keeps of its stage's output. */
export interface ProbeOutput {
  stageId: string;
  kind: string;
  format: StreamFormat;
  spectrum?: SpectrumResult;
  spectrogram?: SpectrogramResult;
  readouts?: Readout[];
  trace?: TraceResult;
  /** Up to a few thousand complex points for a constellation plot (interleaved I, Q). */
  constellation?: number[];
}

/** A streaming processor: keeps its state between blocks, so any block split gives the same output. */
export interface StageProcessor {
  /** Consume one block (layout per input format); return the output produced so far (may be empty). */
  process(input: Float32Array): Float32Array;
  /** End of stream: return whatever output is still held back (may be empty). */
  finish(): Float32Array;
  /** Analysis stages: what they measured, called after `finish`. */
  probe?(): Omit<ProbeOutput, 'stageId' | 'kind' | 'format'>;
}

/** Labels and units for the editor's generated forms, keyed by parameter name. */
export interface FieldInfo {
  label: string;
  /** Unit shown beside the field (`Hz`, `dB`, `deg`, `s`, `samples`); absent for pure numbers and choices. */
  unit?: string;
  help?: string;
}

/** Everything the engine and the editor know about one stage kind. */
export interface StageDefinition<P = unknown> {
  kind: string;
  /** Short title for the stage picker. */
  title: string;
  /** One-line explanation for the stage picker. */
  summary: string;
  /** Parameter schema with defaults and limits; `schema.parse({})` gives the defaults where all have one. */
  schema: z.ZodType<P, z.ZodTypeDef, unknown>;
  fields: Record<string, FieldInfo>;
  /** Sample types this kind accepts as input. */
  accepts: SampleType[];
  /** Output format and warnings for an input format (no stage id: the caller adds it). */
  propagate(params: P, input: StreamFormat): { output: StreamFormat; issues: ChainIssue[] };
  /** A fresh streaming processor for this input format. */
  create(params: P, input: StreamFormat): StageProcessor;
}
