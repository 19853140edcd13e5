/**
 * WAV upload: the RIFF chunks before the `data` chunk are walked here and fed to the formats
 * WavReader, which checks them (lying sizes, odd formats); the data chunk's bytes are then handed
 * on untouched, so a WAV capture is stored as its raw samples with the matching SigMF datatype.
 * 24-bit PCM, which SigMF has no datatype for, is the one exception: it is widened to 32-bit on
 * the way (formats/pcm24.ts) and stored as ri32_le / ci32_le with the same full scale.
 */
import { FormatError, WavReader, formatDatatype, parseDatatype, type Datatype } from '@/dsp/formats';
import type { SampleType } from '@/dsp/types';
import type { ByteReader } from './byte-reader';

/** Header bytes (everything before the data samples) accepted at most: a long LIST or bext chunk is fine, a file of junk is not. */
const MAX_HEADER_BYTES = 16 * 1024 * 1024;

/** What a WAV header says about its samples. */
export interface WavHeader {
  datatype: Datatype;
  layout: SampleType;
  /** Samples per second per channel (Hz). */
  sampleRate: number;
  /** Bytes of sample data the data chunk declares. */
  dataBytes: number;
  /** The file holds 24-bit PCM, stored widened to the 32-bit `datatype`. */
  widen24: boolean;
}

/**
 * Reads a WAV file's header up to the first sample; `asComplex` takes a two-channel file as I
 * (left) and Q (right). FormatErrors carry field `body` with the WAV field in the message.
 */
export async function readWavHeader(reader: ByteReader, asComplex: boolean): Promise<WavHeader> {
  const wav = new WavReader({ asComplex });
  try {
    wav.push(await reader.readExact(12, 'body', 'the RIFF/WAVE header'));
    while (wav.dataBytes === null) {
      if (reader.position > MAX_HEADER_BYTES) {
        throw new FormatError(`body: no data chunk within the first ${MAX_HEADER_BYTES} bytes of the WAV file`, 'body');
      }
      const header = await reader.read(8);
      if (header.byteLength < 8) {
        // Let the reader say what is missing (no fmt chunk, no data chunk, truncated header).
        wav.push(header);
        wav.end();
        throw new FormatError('body: the WAV file ends before its data chunk', 'body', { code: 'truncated' });
      }
      wav.push(header);
      if (wav.dataBytes !== null) break;
      const size = new DataView(header.buffer, header.byteOffset, 8).getUint32(4, true);
      for await (const piece of reader.take(size + (size % 2), 'body', `the WAV chunk "${ascii(header)}"`)) wav.push(piece);
    }
  } catch (error) {
    throw asBodyError(error);
  }
  const format = wav.format!;
  const widen24 = format.encoding.kind === 'i' && format.bitsPerSample === 24;
  const encoding = widen24 ? { ...format.encoding, bits: 32 as const } : format.encoding;
  let datatype: Datatype;
  try {
    datatype = parseDatatype(formatDatatype(encoding, wav.layout === 'complex'));
  } catch (error) {
    throw new FormatError(`datatype: ${format.bitsPerSample}-bit WAV samples have no SigMF datatype (use 8, 16, 24 or 32-bit PCM, or float)`, 'datatype');
  }
  return { datatype, layout: wav.layout!, sampleRate: format.sampleRate, dataBytes: wav.dataBytes!, widen24 };
}

function ascii(header: Uint8Array): string {
  return String.fromCharCode(...header.subarray(0, 4)).replace(/[^\x20-\x7e]/g, '?');
}

function asBodyError(error: unknown): unknown {
  if (error instanceof FormatError && error.field !== 'body' && error.field !== 'layout') {
    return new FormatError(`body: WAV ${error.message}`, 'body', { code: error.code, ...(error.sampleIndex !== null ? { sampleIndex: error.sampleIndex } : {}) });
  }
  return error;
}
