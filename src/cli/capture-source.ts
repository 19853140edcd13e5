/**
 * Opening a capture for the command line: a SigMF pair (`.sigmf-meta` with its `.sigmf-data`
 * beside it), a WAV file, or a raw sample file described by options. Samples are read with large
 * synchronous reads into one reused buffer and decoded without copying where the datatype allows
 * (cf32_le / rf32_le), so a block handed out is valid only until the next one is requested.
 */
import { closeSync, existsSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { basename, extname } from 'node:path';
import {
  FormatError, SampleDecoder, WavReader, checkLayoutFits, parseDatatype, parseLayout,
  parseSigmfMeta, sigmfSampleShape, type Datatype, type SigmfMeta, type ValueEncoding,
} from '../dsp/formats/index';
import type { SampleType, StreamFormat } from '../dsp/types';
import { valuesPerSample } from '../dsp/types';
import { streamFormatOf, type Capture } from '../contracts/capture';
import { InputError } from './errors';

/**
 * Options that describe a raw capture or override what a file says: the capture contract's fields
 * (checked here, so the layout is still the text typed), plus how much to read at once.
 */
export type CaptureOptions = Partial<Pick<Capture, 'datatype' | 'sampleRate'>> & {
  /** Centre frequency (Hz). */
  centerFrequency?: NonNullable<Capture['centerFrequency']>;
  layout?: string;
  /** Bytes per read (default 1 MiB). */
  readBytes?: number;
};

/** An opened capture: what it holds and a way to stream its samples once or more. */
export interface OpenedCapture {
  kind: 'sigmf' | 'wav' | 'raw';
  /** The file the user named and the file holding the samples. */
  path: string;
  dataPath: string;
  format: StreamFormat;
  /** Datatype in SigMF notation, or a WAV description such as `WAV PCM 24-bit`. */
  datatypeLabel: string;
  /** Whole samples in the capture. */
  totalSamples: number;
  /** Bytes of sample data. */
  dataBytes: number;
  meta?: SigmfMeta;
  /** Decoded blocks in the capture's layout; each block is valid until the next is requested. */
  blocks(): Generator<Float32Array>;
}

const DEFAULT_READ_BYTES = 1 << 20;

/** Open a capture by file name; InputError names the field when something does not fit. */
export function openCapture(path: string, options: CaptureOptions = {}): OpenedCapture {
  if (!existsSync(path)) throw new InputError(`input: ${path}: no such file`);
  const ext = extname(path).toLowerCase();
  if (ext === '.sigmf-meta' || ext === '.sigmf-data') return openSigmf(path, options);
  if (ext === '.wav' || ext === '.wave') return openWav(path, options);
  return openRaw(path, options);
}

function assertRate(rate: number | undefined, field: string): number {
  if (rate === undefined) throw new InputError(`${field}: missing; the sample rate (Hz) is needed`);
  if (!Number.isFinite(rate) || rate <= 0) throw new InputError(`${field}: must be > 0 Hz, got ${rate}`);
  return rate;
}

function optionalFrequency(value: number | undefined, field: string): number | undefined {
  if (value !== undefined && !Number.isFinite(value)) throw new InputError(`${field}: must be a finite number of Hz, got ${value}`);
  return value;
}

function openSigmf(path: string, options: CaptureOptions): OpenedCapture {
  const base = path.replace(/\.sigmf-(meta|data)$/i, '');
  const metaPath = `${base}.sigmf-meta`;
  const dataPath = `${base}.sigmf-data`;
  if (!existsSync(metaPath)) throw new InputError(`input: ${basename(metaPath)}: metadata file not found beside the data`);
  if (!existsSync(dataPath)) throw new InputError(`input: ${basename(dataPath)}: data file not found beside ${basename(metaPath)}`);
  if (options.datatype !== undefined) throw new InputError('--datatype: only for raw captures; a SigMF capture names its own core:datatype');
  let meta: SigmfMeta;
  try {
    meta = parseSigmfMeta(readFileSync(metaPath, 'utf8'));
  } catch (error) {
    throw new InputError(`${basename(metaPath)}: ${(error as Error).message}`);
  }
  const shape = sigmfSampleShape(meta);
  let layout = shape.layout;
  if (options.layout !== undefined) {
    layout = parseLayout(options.layout, '--layout');
    checkLayoutFits(layout, shape.datatype, '--layout');
  }
  const sampleRate = assertRate(options.sampleRate ?? meta.global.sampleRate, options.sampleRate !== undefined ? '--sample-rate' : `${basename(metaPath)}: global.core:sample_rate`);
  const centerFrequency = optionalFrequency(options.centerFrequency ?? meta.captures[0]?.frequency, '--center-frequency');
  return rawLike('sigmf', path, dataPath, shape.datatype, layout, sampleRate, centerFrequency, options, meta);
}

function openRaw(path: string, options: CaptureOptions): OpenedCapture {
  if (options.datatype === undefined) {
    throw new InputError(`--datatype: needed for a raw capture (${basename(path)} is not .sigmf-meta or .wav), e.g. --datatype cf32_le`);
  }
  const datatype = parseDatatype(options.datatype, '--datatype');
  const layout = options.layout !== undefined ? parseLayout(options.layout, '--layout') : datatype.complex ? 'complex' : 'real';
  checkLayoutFits(layout, datatype, '--layout');
  const sampleRate = assertRate(options.sampleRate, '--sample-rate');
  return rawLike('raw', path, path, datatype, layout, sampleRate, optionalFrequency(options.centerFrequency, '--center-frequency'), options);
}

function rawLike(
  kind: 'sigmf' | 'raw', path: string, dataPath: string, datatype: Datatype, layout: SampleType,
  sampleRate: number, centerFrequency: number | undefined, options: CaptureOptions, meta?: SigmfMeta,
): OpenedCapture {
  const dataBytes = statSync(dataPath).size;
  const bytesPerSample = (datatype.bits / 8) * valuesPerSample(layout);
  if (dataBytes % bytesPerSample !== 0) {
    throw new InputError(
      `${basename(dataPath)}: ${dataBytes} bytes is not a whole number of ${bytesPerSample}-byte ${datatype.name} ${layout} samples (truncated file or wrong datatype?)`,
    );
  }
  const format = streamFormatOf({ sampleRate, layout, centerFrequency: centerFrequency ?? null });
  const readBytes = alignedReadSize(options.readBytes, bytesPerSample);
  return {
    kind, path, dataPath, format, meta, dataBytes,
    datatypeLabel: datatype.name,
    totalSamples: dataBytes / bytesPerSample,
    *blocks() {
      const decoder = new SampleDecoder(datatype, layout, { zeroCopy: true });
      for (const bytes of readChunks(dataPath, readBytes, 0, dataBytes)) yield wrapFormatErrors(dataPath, () => decoder.decode(bytes));
      wrapFormatErrors(dataPath, () => decoder.end());
    },
  };
}

function openWav(path: string, options: CaptureOptions): OpenedCapture {
  if (options.datatype !== undefined) throw new InputError('--datatype: only for raw captures; a WAV file states its own sample format');
  const wanted = options.layout !== undefined ? parseLayout(options.layout, '--layout') : undefined;
  const asComplex = wanted === 'complex';
  // Read the header once to learn the format; the sample stream re-reads from the start.
  const probe = new WavReader({ asComplex });
  const fileBytes = statSync(path).size;
  for (const bytes of readChunks(path, 64 * 1024, 0, Math.min(fileBytes, 1 << 20))) {
    wrapFormatErrors(path, () => probe.push(bytes));
    if (probe.declaredFrames !== null) break;
  }
  if (!probe.format || probe.declaredFrames === null) {
    wrapFormatErrors(path, () => probe.end());
    throw new InputError(`${basename(path)}: data: no data chunk found in the first MiB`);
  }
  const wav = probe.format;
  const layout = probe.layout!;
  if (wanted !== undefined && wanted !== layout) {
    throw new InputError(`--layout: ${wanted} does not fit a ${wav.channels}-channel WAV (it reads as ${layout}${wav.channels === 2 ? ' or complex' : ''})`);
  }
  const sampleRate = options.sampleRate !== undefined ? assertRate(options.sampleRate, '--sample-rate') : wav.sampleRate;
  const centerFrequency = optionalFrequency(options.centerFrequency, '--center-frequency');
  const format = streamFormatOf({ sampleRate, layout, centerFrequency: centerFrequency ?? null });
  const readBytes = alignedReadSize(options.readBytes, 8);
  return {
    kind: 'wav', path, dataPath: path, format,
    datatypeLabel: wavLabel(wav.encoding, wav.channels, wav.extensible),
    totalSamples: probe.declaredFrames,
    dataBytes: probe.dataBytes ?? 0,
    *blocks() {
      const reader = new WavReader({ asComplex, zeroCopy: true });
      for (const bytes of readChunks(path, readBytes, 0, fileBytes)) {
        const out = wrapFormatErrors(path, () => reader.push(bytes));
        if (out.length > 0) yield out;
      }
      wrapFormatErrors(path, () => reader.end());
    },
  };
}

function wavLabel(encoding: ValueEncoding, channels: number, extensible: boolean): string {
  const kind = encoding.kind === 'f' ? 'float' : 'PCM';
  return `WAV ${kind} ${encoding.bits}-bit, ${channels} channel${channels > 1 ? 's' : ''}${extensible ? ' (extensible)' : ''}`;
}

function wrapFormatErrors<T>(path: string, action: () => T): T {
  try {
    return action();
  } catch (error) {
    if (error instanceof FormatError) throw new InputError(`${basename(path)}: ${error.message}`);
    throw error;
  }
}

function alignedReadSize(requested: number | undefined, bytesPerSample: number): number {
  const size = Math.max(requested ?? DEFAULT_READ_BYTES, bytesPerSample);
  // A multiple of 8 and of the sample size keeps every block on whole, aligned samples.
  const unit = bytesPerSample % 8 === 0 ? bytesPerSample : bytesPerSample * 8;
  return Math.max(unit, size - (size % unit));
}

/** Yield consecutive byte ranges of a file from one reused, 8-byte aligned buffer. */
export function* readChunks(path: string, chunkBytes: number, start: number, end: number): Generator<Uint8Array> {
  const fd = openSync(path, 'r');
  try {
    const buffer = new Uint8Array(new ArrayBuffer(chunkBytes));
    let position = start;
    while (position < end) {
      const want = Math.min(chunkBytes, end - position);
      let got = 0;
      while (got < want) {
        const n = readSync(fd, buffer, got, want - got, position + got);
        if (n === 0) break;
        got += n;
      }
      if (got === 0) throw new InputError(`${basename(path)}: file shrank while being read (expected ${end} bytes, ended at ${position})`);
      position += got;
      yield buffer.subarray(0, got);
    }
  } finally {
    closeSync(fd);
  }
}
