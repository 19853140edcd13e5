/**
 * WAV (RIFF/WAVE) layout facts shared by the reader and writer.
 *
 * Source: Microsoft/IBM, "Multimedia Programming Interface and Data Specifications 1.0", 1991
 * (RIFF chunks, `fmt ` and `data`, WAVE_FORMAT_PCM, word-aligned chunks with a pad byte after odd
 * sizes, 8-bit PCM unsigned), and Microsoft, "Multiple Channel Audio Data and WAVE Files", 2007
 * (WAVE_FORMAT_EXTENSIBLE = 0xFFFE, cbSize 22, SubFormat GUID whose first two bytes hold the real
 * format tag followed by 00000000-0010-0080-00AA00389B71).
 */
import type { SampleType } from '../types';
import { FormatError, type ValueEncoding } from './datatype';

export const WAVE_FORMAT_PCM = 0x0001;
export const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
export const WAVE_FORMAT_EXTENSIBLE = 0xfffe;

/** Bytes 2..15 of every KSDATAFORMAT_SUBTYPE GUID built on a WAVE format tag. */
export const SUBFORMAT_GUID_TAIL = Uint8Array.from([
  0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71,
]);

/** What a WAV file's `fmt ` chunk says, checked. */
export interface WavFormat {
  /** Effective format tag: PCM (1) or IEEE float (3), also when stored as extensible. */
  formatTag: number;
  extensible: boolean;
  channels: 1 | 2;
  /** Samples per second per channel (Hz). */
  sampleRate: number;
  bitsPerSample: number;
  /** Bytes per frame (one sample of every channel). */
  blockAlign: number;
  encoding: ValueEncoding;
}

/** Value encoding of a WAV sample format; FormatError naming the field when unsupported. */
export function wavEncoding(formatTag: number, bitsPerSample: number): ValueEncoding {
  if (formatTag === WAVE_FORMAT_PCM) {
    // 8-bit WAV PCM is unsigned offset binary; wider PCM is signed two's complement.
    if (bitsPerSample === 8) return { kind: 'u', bits: 8, littleEndian: true };
    if (bitsPerSample === 16 || bitsPerSample === 24 || bitsPerSample === 32) {
      return { kind: 'i', bits: bitsPerSample, littleEndian: true };
    }
    throw new FormatError(`fmt: bits per sample ${bitsPerSample} is not supported for PCM (8, 16, 24 or 32)`, 'fmt.bitsPerSample');
  }
  if (formatTag === WAVE_FORMAT_IEEE_FLOAT) {
    if (bitsPerSample === 32 || bitsPerSample === 64) return { kind: 'f', bits: bitsPerSample, littleEndian: true };
    throw new FormatError(`fmt: bits per sample ${bitsPerSample} is not supported for IEEE float (32 or 64)`, 'fmt.bitsPerSample');
  }
  throw new FormatError(
    `fmt: format tag 0x${formatTag.toString(16).padStart(4, '0')} is not supported (PCM 0x0001, IEEE float 0x0003, extensible 0xfffe)`,
    'fmt.formatTag',
  );
}

/** Sample layout of a WAV's channels: 1 -> real, 2 -> real-pair unless the caller says complex. */
export function wavLayout(channels: number, asComplex = false): SampleType {
  if (channels === 1) {
    if (asComplex) throw new FormatError('layout: a one-channel WAV cannot be complex (needs I and Q channels)', 'layout');
    return 'real';
  }
  return asComplex ? 'complex' : 'real-pair';
}

/** What a WAV writer needs to know. */
export interface WavSpec {
  /** Samples per second per channel (Hz); a positive integer. */
  sampleRate: number;
  channels: 1 | 2;
  /** 'pcm8' | 'pcm16' | 'pcm24' | 'pcm32' | 'float32'. */
  sampleFormat: WavSampleFormat;
  /** Write WAVE_FORMAT_EXTENSIBLE instead of the plain tag. */
  extensible?: boolean;
}

export type WavSampleFormat = 'pcm8' | 'pcm16' | 'pcm24' | 'pcm32' | 'float32';

/** Format tag and bits of a writer sample format. */
export function wavSampleFormatInfo(format: WavSampleFormat): { formatTag: number; bits: number } {
  switch (format) {
    case 'pcm8': return { formatTag: WAVE_FORMAT_PCM, bits: 8 };
    case 'pcm16': return { formatTag: WAVE_FORMAT_PCM, bits: 16 };
    case 'pcm24': return { formatTag: WAVE_FORMAT_PCM, bits: 24 };
    case 'pcm32': return { formatTag: WAVE_FORMAT_PCM, bits: 32 };
    case 'float32': return { formatTag: WAVE_FORMAT_IEEE_FLOAT, bits: 32 };
    default: throw new FormatError(`sampleFormat: unknown WAV sample format "${String(format)}"`, 'sampleFormat');
  }
}
