/**
 * Member list of a POSIX tar archive (IEEE Std 1003.1, ustar format), read from its 512-byte
 * headers only, so a multi-GiB `.sigmf` archive is never loaded whole: the data member is later
 * sent as a slice of the file.
 */

/** One regular file inside the archive: its name, where its bytes start and how many there are. */
export interface TarMember {
  name: string;
  offset: number;
  size: number;
}

const BLOCK = 512;

function text(bytes: Uint8Array, start: number, length: number): string {
  const field = bytes.subarray(start, start + length);
  const end = field.indexOf(0);
  return new TextDecoder().decode(end === -1 ? field : field.subarray(0, end));
}

/** Regular-file members of a tar archive, in order (pax and GNU long names included). */
export async function readTarMembers(file: Blob, maxMembers = 64): Promise<TarMember[]> {
  const members: TarMember[] = [];
  let position = 0;
  let longName: string | null = null;
  while (position + BLOCK <= file.size && members.length < maxMembers) {
    const header = new Uint8Array(await file.slice(position, position + BLOCK).arrayBuffer());
    if (header.every((b) => b === 0)) break;
    const sizeText = text(header, 124, 12).trim();
    const size = parseInt(sizeText || '0', 8);
    if (!Number.isFinite(size)) throw new Error(`tar: member at byte ${position} has an unreadable size "${sizeText}"`);
    const type = String.fromCharCode(header[156] || 48);
    const prefix = text(header, 257, 6).startsWith('ustar') ? text(header, 345, 155) : '';
    let name = longName ?? (prefix ? `${prefix}/${text(header, 0, 100)}` : text(header, 0, 100));
    longName = null;
    const body = position + BLOCK;
    if (type === 'L' || type === 'x') {
      // GNU long name, or a pax header whose `path` record names the next member.
      const content = await file.slice(body, body + size).text();
      longName = type === 'L' ? content.replace(/\0+$/, '') : (/\d+ path=([^\n]*)\n/.exec(content)?.[1] ?? null);
    } else if (type === '0' || type === '\0' || type === '7') {
      name = name.replace(/^\.\//, '');
      members.push({ name, offset: body, size });
    }
    position = body + Math.ceil(size / BLOCK) * BLOCK;
  }
  return members;
}
