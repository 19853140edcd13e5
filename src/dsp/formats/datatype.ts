/**
 * SigMF datatype strings and the binary encodings behind them.
 *
 * A datatype is `r` (real) or `c` (complex, I then Q interleaved) followed by a component type:
 * f32, f64, i32, i16, u32, u16 with `_le` or `_be`, or i8, u8 with no byte order. The width is per
 * component: one `cf32_le` sample is 8 bytes. WAV needs one encoding SigMF lacks (24-bit PCM), so
 * the decoders work on a `ValueEncoding` and a SigMF datatype is one way to name it.
 */

/** Binary encoding of one value (one component of a sample). */
export interface ValueEncoding {
  /** `f` IEEE float, `i` two's complement integer, `u` unsigned (offset binary) integer. */
  kind: 'f' | 'i' | 'u';
  /** Bits per value: 8, 16, 24, 32 or 64. */
  bits: 8 | 16 | 24 | 32 | 64;
  /** Byte order; meaningless (true) for 8-bit values. */
  littleEndian: boolean;
}

/** A parsed SigMF datatype. */
export interface Datatype extends ValueEncoding {
  /** True for `c` types: two values (I, Q) per sample. */
  complex: boolean;
  /** The canonical datatype string, e.g. `cf32_le`. */
  name: string;
}

/**
 * What kind of format problem: `truncated` when the bytes stop short of what the format or header
 * promises, `invalid` for anything else. Callers decide on this, never on the message's wording.
 */
export type FormatErrorCode = 'truncated' | 'invalid';

/** Facts a FormatError carries beside its message. */
export interface FormatErrorFacts {
  code?: FormatErrorCode;
  /** Index of the sample at fault (0-based, from the start of the stream), when one is. */
  sampleIndex?: number;
}

/** Error for any malformed capture description or sample data; `field` names what was wrong. */
export class FormatError extends Error {
  readonly field?: string;
  readonly code: FormatErrorCode;
  readonly sampleIndex: number | null;
  constructor(message: string, field?: string, facts: FormatErrorFacts = {}) {
    super(message);
    this.name = 'FormatError';
    this.field = field;
    this.code = facts.code ?? 'invalid';
    this.sampleIndex = facts.sampleIndex ?? null;
  }
}

const DATATYPE_PATTERN = /^([rc])(f32|f64|i32|i16|u32|u16)_(le|be)$|^([rc])(i8|u8)$/;

/** Every datatype string SigMF defines, for help texts and tests. */
export const SIGMF_DATATYPES: readonly string[] = (() => {
  const names: string[] = [];
  for (const rc of ['r', 'c']) {
    for (const t of ['f32', 'f64', 'i32', 'i16', 'u32', 'u16']) {
      names.push(`${rc}${t}_le`, `${rc}${t}_be`);
    }
    names.push(`${rc}i8`, `${rc}u8`);
  }
  return names;
})();

/** Parse a SigMF datatype string (e.g. `ci16_le`); throws FormatError naming it when unknown. */
export function parseDatatype(name: string, field = 'datatype'): Datatype {
  const text = String(name).trim();
  const m = DATATYPE_PATTERN.exec(text);
  if (!m) {
    throw new FormatError(
      `${field}: unknown datatype "${text}" (expected r or c, then f32/f64/i32/i16/u32/u16 with _le or _be, or i8/u8, e.g. cf32_le)`,
      field,
    );
  }
  const rc = m[1] ?? m[4];
  const t = m[2] ?? m[5];
  const order = m[3];
  return {
    complex: rc === 'c',
    kind: t[0] as 'f' | 'i' | 'u',
    bits: Number(t.slice(1)) as Datatype['bits'],
    littleEndian: order !== 'be',
    name: text,
  };
}

/** Build the datatype string for an encoding and real/complex; throws for 24-bit (not in SigMF). */
export function formatDatatype(encoding: ValueEncoding, complex: boolean): string {
  if (encoding.bits === 24) throw new FormatError('24-bit values have no SigMF datatype', 'datatype');
  if (encoding.bits === 64 && encoding.kind !== 'f') {
    throw new FormatError(`64-bit ${encoding.kind === 'i' ? 'signed' : 'unsigned'} integers have no SigMF datatype`, 'datatype');
  }
  const base = `${complex ? 'c' : 'r'}${encoding.kind}${encoding.bits}`;
  return encoding.bits === 8 ? base : `${base}_${encoding.littleEndian ? 'le' : 'be'}`;
}

/** Bytes per value (one component) of an encoding. */
export function bytesPerValue(encoding: ValueEncoding): number {
  return encoding.bits / 8;
}
