/**
 * Integer full-scale conventions: the one place that says how integer codes map to the engine's
 * floating-point samples, where full scale is 1.0.
 *
 * Signed N-bit (i8, i16, 24-bit WAV PCM, i32), two's complement:
 *   value = code / 2^(N-1)            i8: x / 128, i16: x / 32768, i24: x / 8388608, i32: x / 2^31
 *   so the most negative code is exactly -1.0 and the most positive is 1 - 2^-(N-1).
 * Unsigned N-bit (u8, u16, u32), offset binary with mid-scale at 2^(N-1):
 *   value = (code - 2^(N-1)) / 2^(N-1) u8: (x - 128) / 128, u16: (x - 32768) / 32768,
 *                                       u32: (x - 2^31) / 2^31
 *   (8-bit WAV PCM is unsigned offset binary too: RIFF/WAVE spec, Microsoft 1991.)
 * Encoding is the inverse, rounded to the nearest code and clipped to the code range, so a
 * sample of +1.0 becomes the largest positive code. The quantisation step is 1 / 2^(N-1).
 * Floating-point types (f32, f64) carry values unchanged.
 */
import type { ValueEncoding } from './datatype';

/** Code that stands for 0.0: 0 for signed types, 2^(N-1) for unsigned (offset binary). */
export function integerOffset(encoding: ValueEncoding): number {
  return encoding.kind === 'u' ? 2 ** (encoding.bits - 1) : 0;
}

/** Codes per 1.0 of full scale: 2^(N-1) for N-bit integers, 1 for floats. */
export function integerScale(encoding: ValueEncoding): number {
  return encoding.kind === 'f' ? 1 : 2 ** (encoding.bits - 1);
}

/** Smallest and largest code of an integer encoding (as stored, before the offset is removed). */
export function codeRange(encoding: ValueEncoding): { min: number; max: number } {
  const half = 2 ** (encoding.bits - 1);
  return encoding.kind === 'u' ? { min: 0, max: 2 * half - 1 } : { min: -half, max: half - 1 };
}

/** Largest round-trip error of one value (full scale 1.0): half a code step, or float32 rounding. */
export function quantisationTolerance(encoding: ValueEncoding): number {
  if (encoding.kind === 'f') return encoding.bits === 64 ? 0 : 2 ** -24;
  // i32/u32 codes do not fit a float32 mantissa; the engine's float32 blocks round them.
  return Math.max(0.5 / integerScale(encoding), 2 ** -24);
}
