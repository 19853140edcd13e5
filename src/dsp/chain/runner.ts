/**
 * The chain runner: streams a capture, block by block, through every stage of a chain, keeps what
 * the probes ask for and hands the final output to the caller. Memory is bounded by the block size
 * and the probes, not by the capture length.
 */
import { valuesPerSample, type ChainIssue, type ProbeOutput, type StageDefinition, type StageProcessor, type StreamFormat } from '../types';
import { stageDefinitions } from '../stages/index';
import { createFilterDecimateProcessor, decimateStage, type DecimateParams } from '../stages/decimate';
import { filterStage, type FilterParams } from '../stages/filter';
import { DefaultProbe } from './default-probe';
import type { ChainDocument } from './document';
import { stageLabel } from './messages';
import { resolveChain } from './propagate';
import { abortError, ChainRunError, isAbortError } from './run-error';

/** Progress of a run. */
export interface RunProgress {
  /** samplesIn / totalSamples (0 while the total is unknown), 1 at the end. */
  fraction: number;
  /** Input samples consumed so far. */
  samplesIn: number;
  /** During the final flush: the stage whose held-back output is being drained. */
  stageId?: string;
}

export interface RunOptions {
  /** Input samples the source will deliver, for `fraction`. */
  totalSamples?: number;
  /** Cancels the run: it then throws an error named 'AbortError'. */
  signal?: AbortSignal;
  /** Called after every source block and during the final flush. */
  onProgress?(progress: RunProgress): void;
  /**
   * Receives the chain's output, block by block, in `format`'s layout. The block is only valid
   * during the call (its buffer is reused): copy what must be kept. Awaited when it returns a promise.
   */
  onOutput?(block: Float32Array, format: StreamFormat): void | Promise<void>;
  /** Stage kinds to use instead of the built-in registry (tests, plug-ins). */
  registry?: Record<string, StageDefinition<any>>;
}

export interface ChainRunResult {
  /** One entry per analysis stage and per probed stage, in chain order. */
  probes: ProbeOutput[];
  outputFormat: StreamFormat;
  /** Samples read from the source. */
  samplesIn: number;
  /** Samples handed to onOutput. */
  samplesOut: number;
  /** Warnings found before the run. */
  issues: ChainIssue[];
}

interface ActiveStage {
  index: number;
  stageId: string;
  kind: string;
  output: StreamFormat;
  /** Null for a bypassed stage. */
  processor: StageProcessor | null;
  inputValuesPerSample: number;
  outputValuesPerSample: number;
  /** Samples this stage has consumed. */
  samplesIn: number;
  defaultProbe: DefaultProbe | null;
  /** The stage measures something itself (spectrum, spectrogram, measure). */
  analysis: boolean;
}

/** How long (ms) the runner may compute before letting timers and messages (a cancel) through. */
const YIELD_INTERVAL_MS = 50;

function stageFailure(stage: ActiveStage, sampleIndex: number, cause: unknown, what: string): Error {
  if (isAbortError(cause) || cause instanceof ChainRunError) return cause as Error;
  const reason = cause instanceof Error ? cause.message : String(cause);
  return new ChainRunError(`${stageLabel(stage.index, stage.stageId, stage.kind)}: ${what} failed at input sample ${sampleIndex}: ${reason}`, stage.stageId, stage.kind, sampleIndex, { cause });
}

function yieldToEventLoop(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

function isPromise(value: unknown): value is Promise<void> {
  return typeof value === 'object' && value !== null && typeof (value as Promise<void>).then === 'function';
}

/**
 * Stream `source` (blocks in `inputFormat`'s layout, any sizes) through the chain. Throws
 * ChainRunError when the chain has errors before the run or a stage fails during it, and an error
 * named 'AbortError' when `options.signal` cancels it. Errors thrown by the source pass unchanged.
 */
export async function runChain(
  doc: ChainDocument,
  inputFormat: StreamFormat,
  source: AsyncIterable<Float32Array> | Iterable<Float32Array>,
  options: RunOptions = {},
): Promise<ChainRunResult> {
  const { signal, onProgress, onOutput, totalSamples } = options;
  if (signal?.aborted) throw abortError(signal);
  const resolved = resolveChain(doc, inputFormat, options.registry ?? stageDefinitions);
  const issues = resolved.flatMap((stage) => stage.issues);
  const errors = issues.filter((issue) => issue.severity === 'error');
  if (errors.length > 0) {
    const first = resolved.find((stage) => stage.stageId === errors[0].stageId) ?? resolved[0];
    const more = errors.length > 1 ? ` (and ${errors.length - 1} more problem${errors.length > 2 ? 's' : ''})` : '';
    throw new ChainRunError(`the chain cannot run: ${errors[0].message}${more}`, first?.stageId ?? '', first?.kind ?? '', 0, { issues });
  }
  const outputFormat = resolved.length > 0 ? resolved[resolved.length - 1].output : { ...inputFormat };
  const outputValuesPerSample = valuesPerSample(outputFormat.sampleType);
  const inputValuesPerSample = valuesPerSample(inputFormat.sampleType);

  const stages: ActiveStage[] = resolved.map((stage) => {
    const active: ActiveStage = {
      index: stage.index,
      stageId: stage.stageId,
      kind: stage.kind,
      output: stage.output,
      processor: null,
      inputValuesPerSample: valuesPerSample(stage.input.sampleType),
      outputValuesPerSample: valuesPerSample(stage.output.sampleType),
      samplesIn: 0,
      defaultProbe: null,
      analysis: false,
    };
    if (!stage.bypass) {
      try {
        active.processor = stage.definition!.create(stage.params, stage.input);
      } catch (cause) {
        throw stageFailure(active, 0, cause, 'setting up');
      }
      active.analysis = typeof active.processor.probe === 'function';
    }
    if (stage.probe && !active.analysis) active.defaultProbe = new DefaultProbe(stage.output);
    return active;
  });

  // A FIR filter right before a decimation runs as one polyphase decimator that computes only the
  // kept outputs; the filter's full-rate output is only needed when it is probed.
  for (let s = 0; s + 1 < stages.length; s++) {
    const [filter, decimate] = [resolved[s], resolved[s + 1]];
    if (filter.definition !== filterStage || decimate.definition !== decimateStage) continue;
    if (!stages[s].processor || !stages[s + 1].processor || stages[s].defaultProbe) continue;
    const fused = createFilterDecimateProcessor(filter.params as FilterParams, decimate.params as DecimateParams, filter.input);
    if (!fused) continue;
    stages[s].processor = fused;
    stages[s + 1].processor = { process: (block) => block, finish: () => new Float32Array(0) };
  }

  let samplesIn = 0;
  let samplesOut = 0;

  /** Push `block` (output of stage start - 1, or the source) through stages start.. and out. */
  async function pushFrom(start: number, block: Float32Array): Promise<void> {
    let data = block;
    for (let s = start; s < stages.length && data.length > 0; s++) {
      const stage = stages[s];
      const sampleIndex = stage.samplesIn;
      stage.samplesIn += data.length / stage.inputValuesPerSample;
      if (stage.processor) {
        try {
          data = stage.processor.process(data);
        } catch (cause) {
          throw stageFailure(stage, sampleIndex, cause, 'processing');
        }
        if (data.length % stage.outputValuesPerSample !== 0) {
          throw stageFailure(stage, sampleIndex, new RangeError(`produced ${data.length} values, not a whole number of ${stage.output.sampleType} samples`), 'processing');
        }
      }
      stage.defaultProbe?.push(data);
    }
    if (data.length > 0) {
      samplesOut += data.length / outputValuesPerSample;
      if (onOutput) {
        const pending = onOutput(data, outputFormat);
        if (isPromise(pending)) await pending;
      }
    }
  }

  let lastYield = Date.now();
  let blockNumber = 0;
  for await (const block of source) {
    if (signal?.aborted) throw abortError(signal);
    if (!(block instanceof Float32Array)) throw new TypeError(`source block ${blockNumber}: must be a Float32Array, got ${typeof block}`);
    if (block.length % inputValuesPerSample !== 0) {
      throw new RangeError(`source block ${blockNumber}: ${block.length} values is not a whole number of ${inputFormat.sampleType} samples`);
    }
    blockNumber++;
    samplesIn += block.length / inputValuesPerSample;
    await pushFrom(0, block);
    onProgress?.({ fraction: totalSamples && totalSamples > 0 ? Math.min(1, samplesIn / totalSamples) : 0, samplesIn });
    if (signal && Date.now() - lastYield >= YIELD_INTERVAL_MS) {
      // A cancel arrives as a timer or message callback: it can only run if the loop lets it.
      await yieldToEventLoop();
      lastYield = Date.now();
    }
  }

  for (let s = 0; s < stages.length; s++) {
    if (signal?.aborted) throw abortError(signal);
    const stage = stages[s];
    if (!stage.processor) continue;
    onProgress?.({ fraction: totalSamples && totalSamples > 0 ? Math.min(1, samplesIn / totalSamples) : 0, samplesIn, stageId: stage.stageId });
    let tail: Float32Array;
    try {
      tail = stage.processor.finish();
    } catch (cause) {
      throw stageFailure(stage, stage.samplesIn, cause, 'finishing');
    }
    if (tail.length % stage.outputValuesPerSample !== 0) {
      throw stageFailure(stage, stage.samplesIn, new RangeError(`produced ${tail.length} values, not a whole number of ${stage.output.sampleType} samples`), 'finishing');
    }
    stage.defaultProbe?.push(tail);
    if (tail.length > 0) await pushFrom(s + 1, tail);
  }

  const probes: ProbeOutput[] = [];
  for (const stage of stages) {
    let result: Omit<ProbeOutput, 'stageId' | 'kind' | 'format'> | null = null;
    try {
      if (stage.analysis) result = stage.processor!.probe!();
      else if (stage.defaultProbe) result = stage.defaultProbe.result();
    } catch (cause) {
      throw stageFailure(stage, stage.samplesIn, cause, 'reading the probe');
    }
    if (result) probes.push({ stageId: stage.stageId, kind: stage.kind, format: stage.output, ...result });
  }
  onProgress?.({ fraction: 1, samplesIn });
  return { probes, outputFormat, samplesIn, samplesOut, issues };
}
