/**
 * `.sigmf` archive upload: a tar holding one recording, its `.sigmf-meta` first and then its
 * `.sigmf-data`. The meta is read whole (it is small and describes the samples); the data
 * member's bytes are handed on as they arrive. A streaming upload cannot look ahead, so an
 * archive whose data comes before its meta is refused with a message saying so.
 */
import { FormatError, parseSigmfMeta, type SigmfMeta } from '@/dsp/formats';
import { nextTarEntry, tarPadding, type TarEntry } from '../tar';
import type { ByteReader } from './byte-reader';

/** Zero padding accepted after the end-of-archive marker (bytes). */
const MAX_TRAILING_BYTES = 1024 * 1024;

/** Largest `.sigmf-meta` accepted (bytes): room for many thousands of annotations. */
const MAX_META_BYTES = 4 * 1024 * 1024;

/** What the head of an archive says. */
export interface SigmfArchiveHead {
  meta: SigmfMeta;
  /** Recording name: the member's file name without `.sigmf-meta`. */
  recording: string;
  /** Bytes of the `.sigmf-data` member. */
  dataBytes: number;
}

function baseName(path: string): string {
  return path.slice(path.lastIndexOf('/') + 1);
}

async function nextFile(reader: ByteReader): Promise<TarEntry | null> {
  for (;;) {
    const entry = await nextTarEntry(reader);
    if (!entry) return null;
    if (entry.kind === 'directory') {
      await reader.skip(entry.size + tarPadding(entry.size));
      continue;
    }
    if (entry.kind === 'other') throw new FormatError(`body: archive member "${entry.name}" is not a plain file`, 'body');
    return entry;
  }
}

/** Reads the archive up to the first byte of sample data. */
export async function readSigmfArchiveHead(reader: ByteReader): Promise<SigmfArchiveHead> {
  const first = await nextFile(reader);
  if (!first) throw new FormatError('body: the archive holds no files (expected a .sigmf-meta and a .sigmf-data)', 'body');
  if (first.name.endsWith('.sigmf-data')) {
    throw new FormatError(
      `body: "${first.name}" comes before its .sigmf-meta; a streamed upload needs the .sigmf-meta first in the archive`,
      'body',
    );
  }
  if (!first.name.endsWith('.sigmf-meta')) {
    throw new FormatError(`body: unexpected archive member "${first.name}" (expected a .sigmf-meta, then its .sigmf-data)`, 'body');
  }
  if (first.size > MAX_META_BYTES) throw new FormatError(`body: "${first.name}" is larger than ${MAX_META_BYTES} bytes`, 'body');
  const text = new TextDecoder().decode(await reader.readExact(first.size, 'body', `"${first.name}"`));
  await reader.readExact(tarPadding(first.size), 'body', 'the archive');
  const meta = parseSigmfMeta(text);
  const recording = baseName(first.name).slice(0, -'.sigmf-meta'.length);
  const data = await nextFile(reader);
  const expected = first.name.slice(0, -'.sigmf-meta'.length) + '.sigmf-data';
  if (!data) throw new FormatError(`body: the archive has no "${expected}" after its .sigmf-meta`, 'body');
  if (data.name !== expected) {
    throw new FormatError(`body: archive member "${data.name}" follows "${first.name}"; expected "${expected}"`, 'body');
  }
  return { meta, recording, dataBytes: data.size };
}

/** Reads what follows the data member: padding, then nothing but the end-of-archive marker. */
export async function finishSigmfArchive(reader: ByteReader, dataBytes: number): Promise<void> {
  await reader.skip(tarPadding(dataBytes));
  const extra = await nextFile(reader);
  if (extra) {
    throw new FormatError(`body: the archive holds "${extra.name}" after the recording; upload one recording per archive`, 'body');
  }
  // tar pads an archive with zero blocks up to its record size (10 KiB by default): read them so
  // the whole body is consumed, but refuse anything else after the end-of-archive marker.
  const tail = await reader.read(MAX_TRAILING_BYTES + 1);
  if (tail.byteLength > MAX_TRAILING_BYTES || tail.some((byte) => byte !== 0)) {
    throw new FormatError('body: unexpected bytes after the end of the archive', 'body');
  }
}
