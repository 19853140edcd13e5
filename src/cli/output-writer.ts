/**
 * Writes a run's results into the output directory without ever leaving a half-written set:
 * everything goes to temporary names first and is renamed into place only when the run has
 * succeeded; `abort()` removes the temporary files (and the directory if this run created it).
 */
import { createHash, type Hash } from 'node:crypto';
import { closeSync, existsSync, mkdirSync, openSync, readdirSync, renameSync, rmdirSync, unlinkSync, writeFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import { SampleEncoder, formatSigmfMeta, sigmfShapeOfLayout, type SigmfMeta } from '../dsp/formats/index';
import type { StreamFormat } from '../dsp/types';
import { InputError } from './errors';

/** The final names inside the output directory. */
export const OUTPUT_FILES = { results: 'results.json', meta: 'output.sigmf-meta', data: 'output.sigmf-data' } as const;

/** Streams the chain's output samples to a temporary SigMF data file, then commits all files. */
export class RunOutput {
  readonly dir: string;
  private readonly createdDir: boolean;
  private readonly temps: Record<keyof typeof OUTPUT_FILES, string>;
  private dataFd: number | null = null;
  private encoder: SampleEncoder | null = null;
  private format: StreamFormat | null = null;
  private hash: Hash = createHash('sha512');
  private position = 0;

  constructor(dir: string) {
    this.dir = dir;
    this.createdDir = !existsSync(dir);
    try {
      mkdirSync(dir, { recursive: true });
    } catch (error) {
      throw new InputError(`--out: cannot create ${dir}: ${(error as Error).message}`);
    }
    const tag = `.tmp-${process.pid}-${Date.now().toString(36)}`;
    this.temps = {
      results: join(dir, `.${OUTPUT_FILES.results}${tag}`),
      meta: join(dir, `.${OUTPUT_FILES.meta}${tag}`),
      data: join(dir, `.${OUTPUT_FILES.data}${tag}`),
    };
    this.dataFd = openSync(this.temps.data, 'w');
  }

  /** Datatype written for an output format: cf32_le for complex, rf32_le for real and real-pair. */
  static datatypeFor(format: StreamFormat): string {
    return format.sampleType === 'complex' ? 'cf32_le' : 'rf32_le';
  }

  /** Append one block of output samples (layout of `format`). */
  write(block: Float32Array, format: StreamFormat): void {
    if (!this.encoder) {
      this.format = format;
      this.encoder = new SampleEncoder({ kind: 'f', bits: 32, littleEndian: true }, format.sampleType, { zeroCopy: true });
    }
    const bytes = this.encoder.encode(block);
    this.hash.update(bytes);
    let done = 0;
    while (done < bytes.length) {
      done += writeSync(this.dataFd!, bytes, done, bytes.length - done, this.position + done);
    }
    this.position += bytes.length;
  }

  /** Samples written so far. */
  get samplesWritten(): number {
    return this.encoder?.samplesEncoded ?? 0;
  }

  /** Write the metadata and results and move all three files into place. */
  commit(finalFormat: StreamFormat, meta: Omit<SigmfMeta['global'], 'datatype' | 'version' | 'sampleRate' | 'numChannels' | 'sha512'>, results: unknown): void {
    const format = this.format ?? finalFormat;
    closeSync(this.dataFd!);
    this.dataFd = null;
    const shape = sigmfShapeOfLayout(format.sampleType);
    const inverted = format.spectrumInverted === true;
    const sigmf: SigmfMeta = {
      global: {
        datatype: RunOutput.datatypeFor(format),
        version: '1.2.0',
        sampleRate: format.sampleRate,
        numChannels: shape.numChannels,
        sha512: this.hash.digest('hex'),
        ...meta,
        description: `${meta.description ?? ''}${meta.description ? ' ' : ''}${spectrumSentence(inverted, format.centerFrequency)}`,
        // SigMF extension namespaces are declared in core:extensions; ours is optional to readers.
        extra: {
          ...(meta.extra ?? {}),
          'core:extensions': [{ name: 'quadrille', version: '1.0.0', optional: true }],
          [SPECTRUM_INVERTED_KEY]: inverted,
        },
      },
      captures: [format.centerFrequency !== undefined ? { sampleStart: 0, frequency: format.centerFrequency } : { sampleStart: 0 }],
      annotations: [],
    };
    writeFileSync(this.temps.meta, formatSigmfMeta(sigmf));
    const fd = openSync(this.temps.results, 'w');
    writeSync(fd, `${JSON.stringify(results, jsonNumbers, 2)}\n`);
    closeSync(fd);
    // results.json last: its presence means the run finished.
    renameSync(this.temps.data, join(this.dir, OUTPUT_FILES.data));
    renameSync(this.temps.meta, join(this.dir, OUTPUT_FILES.meta));
    renameSync(this.temps.results, join(this.dir, OUTPUT_FILES.results));
  }

  /** Remove every temporary file (and the directory when this run created it and it is empty). */
  abort(): void {
    if (this.dataFd !== null) {
      try { closeSync(this.dataFd); } catch { /* already closed */ }
      this.dataFd = null;
    }
    for (const path of Object.values(this.temps)) {
      try { unlinkSync(path); } catch { /* never created */ }
    }
    if (this.createdDir) {
      try { if (readdirSync(this.dir).length === 0) rmdirSync(this.dir); } catch { /* leave it */ }
    }
  }
}

/** Extension field of the output's global: true when a component at f stands for RF core:frequency - f. */
export const SPECTRUM_INVERTED_KEY = 'quadrille:spectrum_inverted';

/** How to read the output's frequency axis, in words for core:description. */
function spectrumSentence(inverted: boolean, centerFrequency: number | undefined): string {
  const at = centerFrequency === undefined ? 'the (unstated) RF of 0 Hz' : `RF ${centerFrequency} Hz (core:frequency)`;
  return inverted
    ? `Spectrum inverted (${SPECTRUM_INVERTED_KEY} = true): 0 Hz stands for ${at} and a component at +f for that RF minus f.`
    : `Spectrum upright (${SPECTRUM_INVERTED_KEY} = false): 0 Hz stands for ${at} and a component at +f for that RF plus f.`;
}

/** JSON has no NaN or Infinity: write them as null (a level of -Infinity dB reads as "no power"). */
function jsonNumbers(_key: string, value: unknown): unknown {
  return typeof value === 'number' && !Number.isFinite(value) ? null : value;
}
