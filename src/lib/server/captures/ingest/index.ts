/**
 * Opens an upload body in one of the accepted formats: reads the header (nothing for raw, the
 * RIFF chunks for WAV, the meta member for a `.sigmf` archive), says what it learned, and hands
 * out the sample bytes as a stream plus a `finish` step for whatever follows them.
 */
import { FormatError, Pcm24Widener, buildSigmfMeta, sigmfSampleShape, widenedPcm24Bytes, type SigmfMeta } from '@/dsp/formats';
import type { StatedFields } from '../metadata';
import { ByteReader, type ChunkSource } from './byte-reader';
import { finishSigmfArchive, readSigmfArchiveHead } from './sigmf-archive';
import { readWavHeader } from './wav';

export { ByteReader, type ChunkSource } from './byte-reader';
export { wholeSamples, bytesPerSampleOf, partialSampleError } from './whole-samples';

export const uploadFormats = ['raw', 'wav', 'sigmf'] as const;
export type UploadFormat = (typeof uploadFormats)[number];

/** An upload body whose header has been read. */
export interface OpenedUpload {
  /** What the file itself says about the capture. */
  file: StatedFields;
  /** Bytes of sample data the header announces; null for raw bodies (known only at the end). */
  dataBytes: number | null;
  /** The sample bytes, as they arrive. */
  data: AsyncIterable<Uint8Array>;
  /** Reads what follows the samples (archive trailer); throws if it is not acceptable. */
  finish(): Promise<void>;
}

/** Options of openUpload. */
export interface OpenOptions {
  /** WAV only: take two channels as I/Q (layout complex) instead of real-pair. */
  asComplex?: boolean;
}

/** Reads the header of `source` in `format`; FormatErrors name the field (mostly `body`). */
export async function openUpload(format: UploadFormat, source: ChunkSource, options: OpenOptions = {}): Promise<OpenedUpload> {
  const reader = new ByteReader(source);
  if (format === 'raw') {
    return { file: {}, dataBytes: null, data: reader.rest(), finish: async () => undefined };
  }
  if (format === 'wav') {
    const header = await readWavHeader(reader, options.asComplex ?? false);
    const data = reader.take(header.dataBytes, 'body', 'the WAV data chunk');
    // The WAV reader has already refused a data chunk that is not a whole number of frames.
    return {
      file: {
        datatype: header.datatype,
        layout: header.layout,
        sampleRate: header.sampleRate,
        ...(header.widen24 ? { notes: `Uploaded as 24-bit PCM WAV; stored widened to ${header.datatype.name} (same full scale, lossless).` } : {}),
      },
      dataBytes: header.widen24 ? widenedPcm24Bytes(header.dataBytes) : header.dataBytes,
      data: header.widen24 ? widen24(data) : data,
      // Chunks after the samples (LIST, id3) carry nothing a capture keeps.
      finish: async () => void (await reader.skip(Number.MAX_SAFE_INTEGER)),
    };
  }
  const head = await readSigmfArchiveHead(reader);
  return {
    file: { ...describeSigmf(head.meta), name: head.recording },
    dataBytes: head.dataBytes,
    data: reader.take(head.dataBytes, 'body', 'the .sigmf-data member'),
    finish: () => finishSigmfArchive(reader, head.dataBytes),
  };
}

/** The widened bytes of a stream of 24-bit values. */
async function* widen24(chunks: AsyncIterable<Uint8Array>): AsyncGenerator<Uint8Array> {
  const widener = new Pcm24Widener();
  for await (const chunk of chunks) {
    const out = widener.push(chunk);
    if (out.byteLength > 0) yield out;
  }
  widener.end();
}

/**
 * What a SigMF description says about a capture: datatype and layout, rate, the first capture
 * segment's frequency, the description as notes, and the annotations (as SigMF JSON objects).
 */
export function describeSigmf(meta: SigmfMeta): StatedFields {
  const { datatype, layout } = sigmfSampleShape(meta);
  const frequency = meta.captures[0]?.frequency;
  const json = buildSigmfMeta({ global: { datatype: meta.global.datatype, version: meta.global.version }, captures: [], annotations: meta.annotations });
  return {
    datatype,
    layout,
    sampleRate: meta.global.sampleRate,
    centerFrequency: frequency ?? null,
    notes: meta.global.description,
    annotations: json.annotations as Record<string, unknown>[],
  };
}

export { FormatError };
