/**
 * Conversion loops between bytes and float32 values for one ValueEncoding. Little-endian types on
 * a little-endian machine with an aligned start go through typed-array views (fast); everything
 * else goes through a DataView. Scaling follows full-scale.ts.
 */
import type { ValueEncoding } from './datatype';
import { codeRange, integerOffset, integerScale } from './full-scale';

const HOST_LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** True when `bytes` can be viewed directly as native typed values of this encoding. */
export function canViewNatively(encoding: ValueEncoding, bytes: Uint8Array): boolean {
  const size = encoding.bits / 8;
  if (encoding.bits === 24) return false;
  if (size > 1 && encoding.littleEndian !== HOST_LITTLE_ENDIAN) return false;
  return bytes.byteOffset % size === 0;
}

type NativeArray = Float32Array | Float64Array | Int8Array | Uint8Array | Int16Array | Uint16Array | Int32Array | Uint32Array;

function nativeView(encoding: ValueEncoding, bytes: Uint8Array, count: number): NativeArray {
  const { buffer, byteOffset } = bytes;
  const key = `${encoding.kind}${encoding.bits}`;
  switch (key) {
    case 'f32': return new Float32Array(buffer, byteOffset, count);
    case 'f64': return new Float64Array(buffer, byteOffset, count);
    case 'i8': return new Int8Array(buffer, byteOffset, count);
    case 'u8': return new Uint8Array(buffer, byteOffset, count);
    case 'i16': return new Int16Array(buffer, byteOffset, count);
    case 'u16': return new Uint16Array(buffer, byteOffset, count);
    case 'i32': return new Int32Array(buffer, byteOffset, count);
    case 'u32': return new Uint32Array(buffer, byteOffset, count);
    default: throw new Error(`no native view for ${key}`);
  }
}

/** Decode `count` values from the start of `src` into `dst[dstOffset...]` (full scale 1.0). */
export function decodeValues(encoding: ValueEncoding, src: Uint8Array, count: number, dst: Float32Array, dstOffset: number): void {
  const offset = integerOffset(encoding);
  const inv = 1 / integerScale(encoding);
  if (canViewNatively(encoding, src)) {
    const view = nativeView(encoding, src, count);
    if (encoding.kind === 'f') {
      dst.set(view, dstOffset);
    } else {
      for (let k = 0; k < count; k++) dst[dstOffset + k] = (view[k] - offset) * inv;
    }
    return;
  }
  const dv = new DataView(src.buffer, src.byteOffset, src.byteLength);
  const le = encoding.littleEndian;
  const size = encoding.bits / 8;
  switch (`${encoding.kind}${encoding.bits}`) {
    case 'f32': for (let k = 0; k < count; k++) dst[dstOffset + k] = dv.getFloat32(k * 4, le); break;
    case 'f64': for (let k = 0; k < count; k++) dst[dstOffset + k] = dv.getFloat64(k * 8, le); break;
    case 'i8': for (let k = 0; k < count; k++) dst[dstOffset + k] = dv.getInt8(k) * inv; break;
    case 'u8': for (let k = 0; k < count; k++) dst[dstOffset + k] = (dv.getUint8(k) - offset) * inv; break;
    case 'i16': for (let k = 0; k < count; k++) dst[dstOffset + k] = dv.getInt16(k * 2, le) * inv; break;
    case 'u16': for (let k = 0; k < count; k++) dst[dstOffset + k] = (dv.getUint16(k * 2, le) - offset) * inv; break;
    case 'i32': for (let k = 0; k < count; k++) dst[dstOffset + k] = dv.getInt32(k * 4, le) * inv; break;
    case 'u32': for (let k = 0; k < count; k++) dst[dstOffset + k] = (dv.getUint32(k * 4, le) - offset) * inv; break;
    case 'i24':
    case 'u24': {
      for (let k = 0; k < count; k++) {
        const p = k * size;
        const b0 = src[le ? p : p + 2], b1 = src[p + 1], b2 = src[le ? p + 2 : p];
        let code = b0 | (b1 << 8) | (b2 << 16);
        if (encoding.kind === 'i' && code & 0x800000) code -= 0x1000000;
        dst[dstOffset + k] = (code - offset) * inv;
      }
      break;
    }
    default: throw new Error(`unsupported encoding ${encoding.kind}${encoding.bits}`);
  }
}

/**
 * Encode `src` values (full scale 1.0) into `dst` bytes starting at 0. Integer codes are rounded
 * to nearest and clipped; returns how many values were clipped.
 */
export function encodeValues(encoding: ValueEncoding, src: Float32Array, dst: Uint8Array): number {
  const count = src.length;
  const le = encoding.littleEndian;
  const dv = new DataView(dst.buffer, dst.byteOffset, dst.byteLength);
  if (encoding.kind === 'f') {
    if (canViewNatively(encoding, dst)) {
      nativeView(encoding, dst, count).set(src);
    } else if (encoding.bits === 32) {
      for (let k = 0; k < count; k++) dv.setFloat32(k * 4, src[k], le);
    } else {
      for (let k = 0; k < count; k++) dv.setFloat64(k * 8, src[k], le);
    }
    return 0;
  }
  const scale = integerScale(encoding);
  const offset = integerOffset(encoding);
  const { min, max } = codeRange(encoding);
  const size = encoding.bits / 8;
  let clipped = 0;
  const native = canViewNatively(encoding, dst) ? nativeView(encoding, dst, count) : null;
  for (let k = 0; k < count; k++) {
    let code = Math.round(src[k] * scale) + offset;
    if (code > max) { code = max; clipped++; } else if (code < min) { code = min; clipped++; }
    if (native) { native[k] = code; continue; }
    const p = k * size;
    switch (encoding.bits) {
      case 8: dst[p] = code & 0xff; break;
      case 16: if (encoding.kind === 'i') dv.setInt16(p, code, le); else dv.setUint16(p, code, le); break;
      case 32: if (encoding.kind === 'i') dv.setInt32(p, code, le); else dv.setUint32(p, code, le); break;
      case 24: {
        const u = code & 0xffffff;
        dst[le ? p : p + 2] = u & 0xff;
        dst[p + 1] = (u >> 8) & 0xff;
        dst[le ? p + 2 : p] = (u >> 16) & 0xff;
        break;
      }
      default: throw new Error(`unsupported encoding ${encoding.kind}${encoding.bits}`);
    }
  }
  return clipped;
}
