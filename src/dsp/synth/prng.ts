/**
 * Deterministic pseudo-random numbers for the synthesizer: the same seed gives the same numbers on
 * every platform, because the generator uses only 32-bit integer operations (Math.imul, shifts,
 * xor), which ECMAScript defines exactly.
 *
 * Generator: xoshiro128** (D. Blackman and S. Vigna, "Scrambled Linear Pseudorandom Number
 * Generators", ACM TOMS 47(4), 2021), state seeded by a Weyl sequence passed through the 32-bit
 * MurmurHash3 finaliser (fmix32), so neighbouring seeds and stream ids give unrelated streams.
 *
 * Gaussian values use Marsaglia's polar method (G. Marsaglia and T. A. Bray, "A Convenient Method
 * for Generating Normal Variables", SIAM Review 6(3), 1964). It needs Math.log and Math.sqrt.
 * Math.sqrt is correctly rounded by IEEE 754; Math.log is not required to be by ECMAScript, so an
 * engine with a different log implementation could differ in the last bit of a rare value. Within
 * one JavaScript engine (V8 in Node and Chromium) the output is identical on every machine.
 */

/** MurmurHash3's 32-bit finaliser: a bijective mix of all input bits into all output bits. */
function fmix32(value: number): number {
  let h = value | 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** 2^-31: maps a uint32 to [0, 2) before shifting to [-1, 1). */
const TWO_POW_MINUS_31 = 1 / 2147483648;
/** 2^-32: maps a uint32 to [0, 1). */
const TWO_POW_MINUS_32 = 1 / 4294967296;

/** xoshiro128** generator over four 32-bit words of state. */
export class Xoshiro128 {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  /**
   * A generator for `seed` (any integer; only its low 32 bits count) and `stream` (a small integer
   * naming an independent sequence, e.g. one per signal component).
   */
  constructor(seed: number, stream = 0) {
    if (!Number.isInteger(seed)) throw new RangeError(`seed: must be an integer, got ${seed}`);
    if (!Number.isInteger(stream) || stream < 0) throw new RangeError(`stream: must be an integer >= 0, got ${stream}`);
    // Weyl sequence from a start that depends on both seed and stream; fmix32 makes each word of
    // state look unrelated to the next even for seeds 0, 1, 2...
    let weyl = fmix32((seed >>> 0) ^ fmix32(stream + 0x6a09e667));
    const word = (): number => {
      weyl = (weyl + 0x9e3779b9) | 0;
      return fmix32(weyl) | 0;
    };
    this.s0 = word();
    this.s1 = word();
    this.s2 = word();
    this.s3 = word();
    // An all-zero state would only ever produce zeros.
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** A generator with its four state words set directly (for checks against reference outputs). */
  static fromState(s0: number, s1: number, s2: number, s3: number): Xoshiro128 {
    const g = new Xoshiro128(0);
    g.s0 = s0 | 0;
    g.s1 = s1 | 0;
    g.s2 = s2 | 0;
    g.s3 = s3 | 0;
    if ((g.s0 | g.s1 | g.s2 | g.s3) === 0) throw new RangeError('state: must not be all zero');
    return g;
  }

  /** Next value as an unsigned 32-bit integer. */
  nextUint32(): number {
    const s1 = this.s1;
    const scrambled = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return scrambled >>> 0;
  }

  /** Next value uniform in [0, 1) with 32 bits of resolution. */
  nextUnit(): number {
    return this.nextUint32() * TWO_POW_MINUS_32;
  }

  /** Next value uniform in [-1, 1) with 32 bits of resolution. */
  nextSigned(): number {
    return this.nextUint32() * TWO_POW_MINUS_31 - 1;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/**
 * Standard normal values (mean 0, variance 1) from a Xoshiro128 stream, by the polar method.
 * Values come out in a fixed order, so a consumer that draws them sample by sample gets the same
 * sequence however it splits its work into blocks.
 */
export class GaussianSource {
  private readonly uniform: Xoshiro128;
  private spare = 0;
  private hasSpare = false;

  constructor(seed: number, stream = 0) {
    this.uniform = new Xoshiro128(seed, stream);
  }

  /** Next standard normal value. */
  next(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u: number;
    let v: number;
    let s: number;
    do {
      u = this.uniform.nextSigned();
      v = this.uniform.nextSigned();
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const scale = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * scale;
    this.hasSpare = true;
    return u * scale;
  }
}
