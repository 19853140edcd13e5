/**
 * `quadrille run --chain CHAIN.json --input CAPTURE --out DIR`: stream a capture through a chain
 * and write DIR/results.json plus the chain's final output as DIR/output.sigmf-meta/-data.
 */
import { readFileSync } from 'node:fs';
import { basename, resolve } from 'node:path';
import { assertChainDocument } from '../dsp/chain/parse';
import { propagateChain } from '../dsp/chain/propagate';
import { runChain } from '../dsp/chain/runner';
import type { ChainDocument } from '../dsp/chain/document';
import { ENGINE_VERSION } from '../dsp/version';
import { openCapture, type CaptureOptions } from './capture-source';
import { InputError } from './errors';
import { RunOutput } from './output-writer';
import { ProgressReporter } from './progress';
import { buildResults } from '../dsp/chain/results';
import { readSetting } from '../lib/config';

export interface RunCommandOptions extends CaptureOptions {
  chain: string;
  input: string;
  out: string;
  quiet?: boolean;
}

/** Read and validate a chain document file; InputError lists every problem on one line. */
export function loadChain(path: string): ChainDocument {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    throw new InputError(`--chain: cannot read ${path}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new InputError(`${basename(path)}: not valid JSON (${(error as Error).message})`);
  }
  try {
    return assertChainDocument(json);
  } catch (error) {
    const issues = (error as { issues?: { message: string }[] }).issues;
    const detail = issues ? issues.map((i) => i.message).join('; ') : (error as Error).message;
    throw new InputError(`${basename(path)}: ${detail}`);
  }
}

/** Run the command; resolves when every output file is in place, throws on any failure. */
export async function runCommand(options: RunCommandOptions, signal?: AbortSignal): Promise<void> {
  const progress = new ProgressReporter(options.quiet);
  const doc = loadChain(options.chain);
  const capture = openCapture(options.input, options);
  const propagation = propagateChain(doc, capture.format);
  const planned = propagation.flatMap((p) => p.issues);
  const errors = planned.filter((i) => i.severity === 'error');
  if (errors.length > 0) throw new InputError(`${basename(options.chain)}: ${errors.map((i) => i.message).join('; ')}`);
  for (const w of planned) progress.note(`warning: ${w.message}`);
  progress.note(
    `running "${doc.name || basename(options.chain)}" (${doc.stages.length} stages) on ${basename(capture.path)}: ` +
      `${capture.totalSamples} ${capture.format.sampleType} samples at ${capture.format.sampleRate} Hz (${capture.datatypeLabel})`,
  );

  const output = new RunOutput(options.out);
  const started = performance.now();
  try {
    const run = await runChain(doc, capture.format, capture.blocks(), {
      totalSamples: capture.totalSamples,
      signal,
      onProgress: (p) => progress.update(p.fraction, p.samplesIn),
      onOutput: (block, format) => output.write(block, format),
    });
    progress.done();
    const seconds = (performance.now() - started) / 1000;
    const committing = performance.now();
    const outputDatatype = RunOutput.datatypeFor(run.outputFormat);
    const results = buildResults({ engineVersion: ENGINE_VERSION, chainPath: resolve(options.chain), doc, capture, run, outputDatatype, seconds });
    output.commit(
      run.outputFormat,
      {
        description: `Output of chain "${doc.name}" on ${basename(capture.path)} (Quadrille engine ${ENGINE_VERSION})`,
      },
      results,
    );
    for (const issue of run.issues) {
      if (!planned.some((p) => p.message === issue.message)) progress.note(`${issue.severity}: ${issue.message}`);
    }
    if (readSetting('QUADRILLE_TIMING')) {
      process.stderr.write(`timing: run ${(seconds * 1000).toFixed(0)} ms, writing results ${(performance.now() - committing).toFixed(0)} ms\n`);
    }
    progress.note(`done in ${seconds.toFixed(2)} s: ${run.samplesOut} output samples, ${run.probes.length} probe(s) -> ${options.out}`);
  } catch (error) {
    progress.done();
    output.abort();
    throw error;
  }
}
