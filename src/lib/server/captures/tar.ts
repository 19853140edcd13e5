/**
 * The POSIX tar (ustar) pieces a `.sigmf` archive needs, read and written as a stream.
 *
 * Source: IEEE Std 1003.1-2017 (POSIX), "pax - portable archive interchange", ustar Interchange
 * Format: 512-byte header blocks (name 0..99, mode 100, uid 108, gid 116, size 124 as 11 octal
 * digits, mtime 136, chksum 148 = sum of the header bytes with the chksum field read as spaces,
 * typeflag 156, magic "ustar\0" 257, version "00" 263, prefix 345..499), file data padded to a
 * multiple of 512 bytes, and two zero blocks at the end; pax extended headers (typeflag `x`)
 * carry `path` and `size` records "<length> <key>=<value>\n". Sizes of 8 GiB and more use the
 * GNU base-256 form (high bit of the first size byte set), which common tar readers accept.
 */
import { FormatError } from '@/dsp/formats';
import type { ByteReader } from './ingest/byte-reader';

export const TAR_BLOCK = 512;

/** Bytes that pad a member of `size` bytes to the next block boundary. */
export function tarPadding(size: number): number {
  return (TAR_BLOCK - (size % TAR_BLOCK)) % TAR_BLOCK;
}

/** One member of an archive as its header describes it. */
export interface TarEntry {
  /** Path inside the archive (prefix joined, pax path applied). */
  name: string;
  /** Bytes of member data. */
  size: number;
  /** `file`, `directory`, or `other` (links, devices). */
  kind: 'file' | 'directory' | 'other';
}

const MAX_EXTENDED_HEADER = 64 * 1024;

function text(block: Uint8Array, start: number, length: number): string {
  const field = block.subarray(start, start + length);
  const end = field.indexOf(0);
  return new TextDecoder().decode(end >= 0 ? field.subarray(0, end) : field);
}

function readSize(block: Uint8Array): number {
  if (block[124]! & 0x80) {
    let value = 0;
    for (let k = 125; k < 136; k++) value = value * 256 + block[k]!;
    return value;
  }
  const digits = text(block, 124, 12).trim();
  const value = digits === '' ? 0 : parseInt(digits, 8);
  if (!/^[0-7]*$/.test(digits) || !Number.isSafeInteger(value)) {
    throw new FormatError(`body: tar header size field "${digits}" is not an octal number`, 'body');
  }
  return value;
}

function checksumOk(block: Uint8Array): boolean {
  const stored = parseInt(text(block, 148, 8).trim() || 'x', 8);
  let sum = 0;
  for (let k = 0; k < TAR_BLOCK; k++) sum += k >= 148 && k < 156 ? 0x20 : block[k]!;
  return stored === sum;
}

function parsePax(bytes: Uint8Array): Record<string, string> {
  const records: Record<string, string> = {};
  let at = 0;
  const decoder = new TextDecoder();
  while (at < bytes.length) {
    const space = bytes.indexOf(0x20, at);
    const length = space > at ? parseInt(decoder.decode(bytes.subarray(at, space)), 10) : NaN;
    if (!Number.isSafeInteger(length) || length <= 0 || at + length > bytes.length) break;
    const record = decoder.decode(bytes.subarray(space + 1, at + length - 1));
    const equals = record.indexOf('=');
    if (equals > 0) records[record.slice(0, equals)] = record.slice(equals + 1);
    at += length;
  }
  return records;
}

/**
 * Reads headers up to the next member, or null at the end-of-archive marker (or a clean end of
 * the body). The caller must then consume `size` bytes and the padding.
 */
export async function nextTarEntry(reader: ByteReader): Promise<TarEntry | null> {
  let longName: string | undefined;
  let pax: Record<string, string> = {};
  for (;;) {
    const block = await reader.read(TAR_BLOCK);
    if (block.byteLength === 0) return null;
    if (block.byteLength < TAR_BLOCK) throw new FormatError('body: the archive ends inside a tar header (truncated upload)', 'body', { code: 'truncated' });
    if (block.every((byte) => byte === 0)) return null;
    if (!checksumOk(block)) throw new FormatError('body: a tar header fails its checksum (not a tar archive, or damaged)', 'body');
    const type = String.fromCharCode(block[156]!);
    const headerSize = readSize(block);
    if (type === 'x' || type === 'g' || type === 'L') {
      if (headerSize > MAX_EXTENDED_HEADER) throw new FormatError(`body: a tar extended header of ${headerSize} bytes is too long`, 'body');
      const content = await reader.readExact(headerSize, 'body', 'a tar extended header');
      await reader.readExact(tarPadding(headerSize), 'body', 'a tar extended header');
      if (type === 'x') pax = { ...pax, ...parsePax(content) };
      if (type === 'L') longName = text(content, 0, content.length);
      continue;
    }
    const magic = text(block, 257, 6);
    const prefix = magic.startsWith('ustar') ? text(block, 345, 155) : '';
    const size = pax.size !== undefined ? Number(pax.size) : headerSize;
    const name = pax.path ?? longName ?? (prefix ? `${prefix}/${text(block, 0, 100)}` : text(block, 0, 100));
    const kind = type === '0' || type === '\0' || type === '7' ? 'file' : type === '5' ? 'directory' : 'other';
    if (!Number.isSafeInteger(size) || size < 0) throw new FormatError(`body: tar member "${name}" has an invalid size`, 'body');
    return { name, size, kind };
  }
}

function writeText(block: Uint8Array, start: number, length: number, value: string): void {
  const bytes = new TextEncoder().encode(value);
  block.set(bytes.subarray(0, length), start);
}

function writeOctal(block: Uint8Array, start: number, length: number, value: number): void {
  writeText(block, start, length - 1, value.toString(8).padStart(length - 1, '0'));
}

/** A ustar header block for a file (`size` bytes) or a directory (name ending in `/`). */
export function tarHeader(name: string, size: number, options: { directory?: boolean; mtimeSeconds?: number } = {}): Uint8Array {
  const bytes = new TextEncoder().encode(name);
  if (bytes.length > 100) throw new RangeError(`tar member name "${name}" is longer than 100 bytes`);
  const block = new Uint8Array(TAR_BLOCK);
  writeText(block, 0, 100, name);
  writeOctal(block, 100, 8, options.directory ? 0o755 : 0o644);
  writeOctal(block, 108, 8, 0);
  writeOctal(block, 116, 8, 0);
  if (size < 8 ** 11) {
    writeOctal(block, 124, 12, size);
  } else {
    block[124] = 0x80;
    let rest = size;
    for (let k = 135; k > 124; k--) {
      block[k] = rest % 256;
      rest = Math.floor(rest / 256);
    }
  }
  writeOctal(block, 136, 12, Math.floor(options.mtimeSeconds ?? Date.now() / 1000));
  block[156] = (options.directory ? '5' : '0').charCodeAt(0);
  writeText(block, 257, 6, 'ustar');
  writeText(block, 263, 2, '00');
  writeText(block, 265, 32, 'quadrille');
  writeText(block, 297, 32, 'quadrille');
  let sum = 0;
  for (let k = 0; k < TAR_BLOCK; k++) sum += k >= 148 && k < 156 ? 0x20 : block[k]!;
  writeText(block, 148, 8, `${sum.toString(8).padStart(6, '0')}\0 `);
  return block;
}

/** The two zero blocks that end an archive. */
export function tarEnd(): Uint8Array {
  return new Uint8Array(2 * TAR_BLOCK);
}
