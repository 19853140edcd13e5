/**
 * Exports of a stored capture, all streamed from the object store: the `.sigmf-meta` JSON, a
 * `.sigmf` archive (tar of meta + data, see tar.ts), and WAV for real and real-pair captures of
 * 8, 16 or 32-bit values. A synthesized capture's meta carries the playback caution in its
 * description, so the warning travels with the file.
 */
import { formatSigmfMeta, parseDatatype, parseSigmfMeta, SIGMF_VERSION, WavWriter, type Datatype, type WavSampleFormat } from '@/dsp/formats';
import { TRANSMIT_CAUTION } from '@/dsp/synth';
import type { ObjectStore } from '../storage';
import { unprocessable } from '../api/errors';
import { parseJsonColumn, type CaptureWithOwner } from './rows';
import { tarEnd, tarHeader, tarPadding, TAR_BLOCK } from './tar';

export const exportFormats = ['sigmf-meta', 'sigmf', 'wav'] as const;
export type ExportFormat = (typeof exportFormats)[number];

/** A file to send: its bytes as a stream, length, type and name. */
export interface ExportFile {
  body: AsyncIterable<Uint8Array>;
  /** Bytes. */
  length: number;
  contentType: string;
  fileName: string;
}

/** A file-name-safe form of a capture name (letters, digits, dashes), never empty. */
export function fileStem(name: string): string {
  const stem = name
    .normalize('NFKD')
    .replace(/[^\w\s.-]/g, '')
    .trim()
    .replace(/[\s.]+/g, '-')
    .replace(/-+/g, '-')
    .slice(0, 80)
    .replace(/^-|-$/g, '');
  return stem || 'capture';
}

/** The `.sigmf-meta` text of a capture (core:sha512 left out: Quadrille hashes with SHA-256). */
export function sigmfMetaText(row: CaptureWithOwner): string {
  const description = [row.notes.trim(), row.source === 'synthesized' ? TRANSMIT_CAUTION : ''].filter(Boolean).join('\n\n');
  const global: Record<string, unknown> = {
    'core:datatype': row.datatype,
    'core:version': SIGMF_VERSION,
    'core:sample_rate': row.sample_rate,
    'core:author': row.owner_name,
  };
  if (row.layout === 'real-pair') global['core:num_channels'] = 2;
  if (description) global['core:description'] = description;
  const capture: Record<string, unknown> = { 'core:sample_start': 0 };
  if (row.center_frequency !== null) capture['core:frequency'] = row.center_frequency;
  // Going through the parser checks the stored annotations and puts every key in canonical order.
  return formatSigmfMeta(parseSigmfMeta({ global, captures: [capture], annotations: parseJsonColumn<unknown[]>(row.annotations, []) }));
}

async function* objectBytes(store: ObjectStore, key: string): AsyncGenerator<Uint8Array, void, undefined> {
  const read = await store.get(key);
  try {
    for await (const chunk of read.stream) yield chunk as Uint8Array;
  } finally {
    read.stream.destroy();
  }
}

/** The meta alone. */
export function exportSigmfMeta(row: CaptureWithOwner): ExportFile {
  const bytes = new TextEncoder().encode(sigmfMetaText(row));
  return { body: [bytes] as unknown as AsyncIterable<Uint8Array>, length: bytes.length, contentType: 'application/sigmf-meta+json', fileName: `${fileStem(row.name)}.sigmf-meta` };
}

/** A `.sigmf` archive: folder `<stem>/` holding `<stem>.sigmf-meta` then `<stem>.sigmf-data`. */
export function exportSigmfArchive(row: CaptureWithOwner, store: ObjectStore): ExportFile {
  const stem = fileStem(row.name).slice(0, 40);
  const meta = new TextEncoder().encode(sigmfMetaText(row));
  const dataBytes = Number(row.byte_size);
  const mtime = Math.floor(Date.parse(row.created_at) / 1000);
  async function* body(): AsyncGenerator<Uint8Array, void, undefined> {
    yield tarHeader(`${stem}/`, 0, { directory: true, mtimeSeconds: mtime });
    yield tarHeader(`${stem}/${stem}.sigmf-meta`, meta.length, { mtimeSeconds: mtime });
    yield meta;
    yield new Uint8Array(tarPadding(meta.length));
    yield tarHeader(`${stem}/${stem}.sigmf-data`, dataBytes, { mtimeSeconds: mtime });
    yield* objectBytes(store, row.storage_key);
    yield new Uint8Array(tarPadding(dataBytes));
    yield tarEnd();
  }
  const length = 3 * TAR_BLOCK + meta.length + tarPadding(meta.length) + dataBytes + tarPadding(dataBytes) + 2 * TAR_BLOCK;
  return { body: body(), length, contentType: 'application/x-tar', fileName: `${stem}.sigmf` };
}

/** How a datatype's values become WAV values: the WAV format, and per value a byte swap and/or sign-bit flip. */
function wavMapping(datatype: Datatype): { format: WavSampleFormat; swap: boolean; flipSign: boolean } | null {
  const swap = datatype.bits > 8 && !datatype.littleEndian;
  if (datatype.kind === 'f') return datatype.bits === 32 ? { format: 'float32', swap, flipSign: false } : null;
  // WAV stores 8-bit PCM unsigned and wider PCM signed; offset binary and two's complement differ
  // only in the top bit, so converting is one bit flip per value.
  if (datatype.bits === 8) return { format: 'pcm8', swap: false, flipSign: datatype.kind === 'i' };
  if (datatype.bits === 16) return { format: 'pcm16', swap, flipSign: datatype.kind === 'u' };
  if (datatype.bits === 32) return { format: 'pcm32', swap, flipSign: datatype.kind === 'u' };
  return null;
}

/** Why a capture cannot be a WAV file, or null when it can. */
export function wavRefusal(row: Pick<CaptureWithOwner, 'layout' | 'datatype' | 'sample_rate' | 'byte_size'>): string | null {
  if (row.layout === 'complex') return 'WAV export is for real and real-pair captures; export complex captures as SigMF.';
  if (!wavMapping(parseDatatype(row.datatype))) return `WAV cannot hold ${row.datatype} values (8, 16 or 32-bit integers, or 32-bit float).`;
  if (!Number.isInteger(row.sample_rate) || row.sample_rate > 0xffffffff) return 'WAV needs a whole number of samples per second below 2^32 Hz.';
  if (Number(row.byte_size) > 0xffffffff - 80) return 'The capture is larger than the 4 GiB a WAV file can hold.';
  return null;
}

/** A WAV file of a real or real-pair capture; 422 `format` when the capture cannot be one. */
export function exportWav(row: CaptureWithOwner, store: ObjectStore): ExportFile {
  const refused = wavRefusal(row);
  if (refused) throw unprocessable('not_exportable', refused, 'format');
  const datatype = parseDatatype(row.datatype);
  const mapping = wavMapping(datatype)!;
  const channels = row.layout === 'real-pair' ? 2 : 1;
  const writer = new WavWriter({ sampleRate: row.sample_rate, channels, sampleFormat: mapping.format });
  const dataBytes = Number(row.byte_size);
  const frames = dataBytes / writer.blockAlign;
  const header = writer.header(frames);
  const pad = dataBytes % 2;
  async function* body(): AsyncGenerator<Uint8Array, void, undefined> {
    yield header;
    const values = objectBytes(store, row.storage_key);
    yield* mapping.swap || mapping.flipSign ? convertValues(values, datatype.bits / 8, mapping.swap, mapping.flipSign) : values;
    if (pad) yield new Uint8Array(pad);
  }
  return { body: body(), length: header.length + dataBytes + pad, contentType: 'audio/wav', fileName: `${fileStem(row.name)}.wav` };
}

/** Byte-swaps and/or flips the sign bit of each `width`-byte value; values may straddle chunks. */
async function* convertValues(chunks: AsyncIterable<Uint8Array>, width: number, swap: boolean, flipSign: boolean): AsyncGenerator<Uint8Array, void, undefined> {
  let carry = new Uint8Array(0);
  for await (const chunk of chunks) {
    const joined = carry.length ? concat(carry, chunk) : chunk;
    const whole = joined.length - (joined.length % width);
    const out = joined.slice(0, whole);
    for (let at = 0; at < whole; at += width) {
      if (swap) out.subarray(at, at + width).reverse();
      // After the swap the most significant byte is the last one (little-endian).
      if (flipSign) out[at + width - 1]! ^= 0x80;
    }
    carry = joined.slice(whole);
    yield out;
  }
}

function concat(a: Uint8Array, b: Uint8Array): Uint8Array {
  const out = new Uint8Array(a.length + b.length);
  out.set(a, 0);
  out.set(b, a.length);
  return out;
}
