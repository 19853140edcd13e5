/**
 * One run, start to end, without threads or database: stream the capture's bytes from the object
 * store, decode them, run the chain, store the output capture under the job's fresh key, build
 * the results (the engine's results.json shape) and cut them into a summary and per-probe previews.
 * The worker entry wraps this; tests can call it directly.
 */
import type { Readable } from 'node:stream';
import { buildResults, ChainRunError, finiteJsonNumbers, isAbortError, runChain } from '@/dsp/chain';
import { FormatError, SampleDecoder, parseDatatype } from '@/dsp/formats';
import { streamFormatOf } from '@/contracts/capture';
import { ENGINE_VERSION } from '@/dsp/version';
import { ObjectNotFoundError, type ObjectStore } from '@/lib/server/storage';
import { probeDataEntries, summarizeResults } from '@/lib/server/runs/probe-data';
import type { PresentedRunError } from '@/contracts/run';
import type { RunJob, WorkerMessage, WorkerOutcome } from '@/lib/server/runs/protocol';
import { OutputSink, outputDatatype } from './output-sink';

export interface ExecuteOptions {
  signal?: AbortSignal;
  /** Progress, at most once per job.progressIntervalMs (and whenever the flushing stage changes). */
  onProgress?(message: Extract<WorkerMessage, { type: 'progress' }>): void;
}

async function* decodedBlocks(stream: Readable, decoder: SampleDecoder): AsyncGenerator<Float32Array> {
  try {
    for await (const chunk of stream) {
      const block = decoder.decode(chunk as Uint8Array);
      if (block.length > 0) yield block;
    }
    decoder.end();
  } finally {
    stream.destroy();
  }
}

/** Where a thrown error places the failure: a stage and its input sample, or the capture itself. */
export function describeFailure(error: unknown): PresentedRunError {
  if (error instanceof ChainRunError) {
    return { message: error.message, stageId: error.stageId || null, kind: error.kind || 'chain', sampleIndex: error.sampleIndex };
  }
  if (error instanceof FormatError) {
    return { message: `capture: ${error.message}`, stageId: null, kind: 'input', sampleIndex: error.sampleIndex };
  }
  if (error instanceof ObjectNotFoundError) {
    return { message: 'capture: its samples are missing from storage', stageId: null, kind: 'input', sampleIndex: null };
  }
  const message = error instanceof Error ? error.message : String(error);
  return { message, stageId: null, kind: 'internal', sampleIndex: null };
}

/** Runs `job`; always resolves with the final message (succeeded, failed or cancelled). */
export async function executeRun(job: RunJob, store: ObjectStore, options: ExecuteOptions = {}): Promise<WorkerOutcome> {
  const started = performance.now();
  const seconds = () => (performance.now() - started) / 1000;
  const { capture } = job;
  const format = streamFormatOf(capture);

  let sink: OutputSink | null = null;
  try {
    const datatype = parseDatatype(capture.datatype);
    const read = await store.get(capture.storageKey);
    const decoder = new SampleDecoder(datatype, capture.layout, { zeroCopy: true });
    sink = new OutputSink(store, job.outputKey);
    const output = sink;
    let lastSent = 0;
    let lastStage: string | null = null;
    const run = await runChain(job.document, format, decodedBlocks(read.stream, decoder), {
      totalSamples: capture.sampleCount,
      signal: options.signal,
      onProgress: (progress) => {
        const stageId = progress.stageId ?? null;
        const now = performance.now();
        if (stageId === lastStage && now - lastSent < job.progressIntervalMs && progress.fraction < 1) return;
        lastSent = now;
        lastStage = stageId;
        options.onProgress?.({ type: 'progress', fraction: progress.fraction, samplesIn: progress.samplesIn, stageId });
      },
      onOutput: (block, blockFormat) => output.write(block, blockFormat),
    });
    const runSeconds = seconds();
    const stored = await output.finish(
      run.outputFormat,
      `Output of chain "${job.chain.name}" revision ${job.chain.revision} on capture "${capture.name}" (Quadrille engine ${ENGINE_VERSION})`,
    );
    const results = buildResults({
      engineVersion: ENGINE_VERSION,
      chainPath: `/api/chains/${job.chain.id}/revisions/${job.chain.revision}`,
      doc: job.document,
      capture: { path: `/api/captures/${capture.id}`, kind: 'sigmf', datatypeLabel: capture.datatype, format },
      run,
      outputDatatype: outputDatatype(run.outputFormat),
      seconds: runSeconds,
    });
    return {
      type: 'succeeded',
      resultsJson: JSON.stringify(results, finiteJsonNumbers),
      // Cut up here, off the web thread: the server files these as they are.
      summaryJson: JSON.stringify(summarizeResults(results), finiteJsonNumbers),
      probeData: probeDataEntries(results),
      output: { key: job.outputKey, bytes: stored.bytes, samples: stored.samples, meta: stored.meta },
      seconds: seconds(),
    };
  } catch (error) {
    await sink?.abort(error);
    if (isAbortError(error) || options.signal?.aborted) return { type: 'cancelled', seconds: seconds() };
    return { type: 'failed', error: describeFailure(error), seconds: seconds() };
  }
}
