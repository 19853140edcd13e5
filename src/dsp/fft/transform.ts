/**
 * One-shot transforms for callers that do not keep buffers: each call allocates its output.
 * Hot loops should hold an FftPlan and their own buffers instead.
 */
import { assertFftSize, getFftPlan } from './plan';

/** Forward DFT of interleaved complex values (length 2n, n a power of two) -> new interleaved spectrum. */
export function fft(input: ArrayLike<number>): Float64Array {
  if (input.length % 2 !== 0) throw new RangeError(`input: length ${input.length} is odd, not interleaved complex values`);
  const n = input.length / 2;
  assertFftSize(n, 'input length / 2');
  const data = Float64Array.from(input);
  return getFftPlan(n).forward(data, new Float64Array(2 * n));
}

/** Inverse DFT (scaled by 1/n) of an interleaved complex spectrum -> new interleaved values. */
export function ifft(spectrum: ArrayLike<number>): Float64Array {
  if (spectrum.length % 2 !== 0) throw new RangeError(`spectrum: length ${spectrum.length} is odd, not interleaved complex values`);
  const n = spectrum.length / 2;
  assertFftSize(n, 'spectrum length / 2');
  return getFftPlan(n).inverse(Float64Array.from(spectrum), new Float64Array(2 * n));
}

/** DFT of n real values (n a power of two) -> bins 0..floor(n/2) interleaved, like numpy.fft.rfft. */
export function realFft(input: ArrayLike<number>): Float64Array {
  const n = input.length;
  assertFftSize(n, 'input length');
  const out = new Float64Array(2 * n);
  getFftPlan(n).forwardReal(Float64Array.from(input), out);
  return out.slice(0, 2 * (Math.floor(n / 2) + 1));
}
