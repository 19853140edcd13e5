/**
 * Planned FFT over fft.js for power-of-two sizes.
 *
 * Memory and bin layout: complex data is interleaved (re, im) in a Float64Array of 2n values; bin k
 * sits at [2k, 2k+1], DC at k = 0, Nyquist at k = n/2, negative frequencies at k > n/2. Forward
 * transforms use e^{-j 2 pi k m / n} and are unnormalised; the inverse divides by n. Input and output
 * must be different arrays (fft.js writes the output while it still reads the input).
 *
 * Every buffer handed to fft.js is a Float64Array: fft.js is fastest when an instance only ever sees
 * one array type, so the plan never mixes plain arrays and typed arrays.
 */
import FFT from 'fft.js';

/** Largest supported transform length (samples). */
export const MAX_FFT_SIZE = 1 << 22;

/** True when n is a power of two between 1 and MAX_FFT_SIZE. */
export function isPowerOfTwo(n: number): boolean {
  return Number.isInteger(n) && n >= 1 && n <= MAX_FFT_SIZE && (n & (n - 1)) === 0;
}

/** Throws a RangeError naming `field` unless `n` is a supported FFT size. */
export function assertFftSize(n: number, field = 'fftSize'): void {
  if (!isPowerOfTwo(n)) {
    throw new RangeError(`${field}: must be a power of two from 1 to ${MAX_FFT_SIZE}, got ${n}`);
  }
}

/** A transform of one fixed size, planned once and run many times. */
export class FftPlan {
  /** Transform length (complex samples). */
  readonly size: number;
  private readonly engine: FFT | null;

  constructor(size: number) {
    assertFftSize(size, 'size');
    this.size = size;
    this.engine = size > 1 ? new FFT(size) : null;
  }

  /** Forward complex transform: `input` and `output` hold 2*size interleaved values. */
  forward(input: Float64Array, output: Float64Array): Float64Array {
    this.check(input, output, 2 * this.size);
    if (this.engine) this.engine.transform(output, input);
    else output.set(input.subarray(0, 2));
    return output;
  }

  /** Inverse complex transform, scaled by 1/size. */
  inverse(input: Float64Array, output: Float64Array): Float64Array {
    this.check(input, output, 2 * this.size);
    if (this.engine) this.engine.inverseTransform(output, input);
    else output.set(input.subarray(0, 2));
    return output;
  }

  /**
   * Forward transform of `size` real values. Fills bins 0..size/2 of `output` (2*size values); with
   * `complete` also the negative-frequency bins as the conjugate mirror.
   */
  forwardReal(input: Float64Array, output: Float64Array, complete = false): Float64Array {
    if (input === output) throw new RangeError('forwardReal: input and output must be different arrays');
    if (input.length < this.size) throw new RangeError(`input: needs ${this.size} real values, got ${input.length}`);
    if (output.length < 2 * this.size) throw new RangeError(`output: needs ${2 * this.size} values, got ${output.length}`);
    if (this.engine) {
      this.engine.realTransform(output, input);
      if (complete) this.engine.completeSpectrum(output);
    } else {
      output[0] = input[0];
      output[1] = 0;
    }
    return output;
  }

  private check(input: Float64Array, output: Float64Array, needed: number): void {
    if (input === output) throw new RangeError('input and output must be different arrays');
    if (input.length < needed) throw new RangeError(`input: needs ${needed} values, got ${input.length}`);
    if (output.length < needed) throw new RangeError(`output: needs ${needed} values, got ${output.length}`);
  }
}

/** How many plans the cache keeps: tables cost 16 bytes per point, so a few sizes is plenty. */
const PLAN_CACHE_LIMIT = 8;
const planCache = new Map<number, FftPlan>();

/** A cached plan for `size` (power of two); the least recently used plan is dropped beyond 8 sizes. */
export function getFftPlan(size: number): FftPlan {
  const cached = planCache.get(size);
  if (cached) {
    // Re-insert to mark it most recently used (Map keeps insertion order).
    planCache.delete(size);
    planCache.set(size, cached);
    return cached;
  }
  const plan = new FftPlan(size);
  planCache.set(size, plan);
  if (planCache.size > PLAN_CACHE_LIMIT) {
    const oldest = planCache.keys().next().value as number;
    planCache.delete(oldest);
  }
  return plan;
}

/** Number of plans currently cached (for tests of the size bound). */
export function cachedPlanCount(): number {
  return planCache.size;
}
