import type { SosMatrix } from './zpk-to-sos';

/**
 * Streaming IIR filter as a cascade of second-order sections in transposed direct form II, with
 * float64 state per section and channel (the form scipy.signal.sosfilt uses; it keeps rounding
 * noise low for poles near the unit circle). Real blocks (1 value per sample) or complex
 * interleaved I/Q (2 values per sample, I and Q filtered independently). Output has the input's
 * length; zero initial state; any block split gives the same samples.
 */
export class BiquadCascade {
  readonly channels: 1 | 2;
  private readonly coefficients: Float64Array;
  private readonly sections: number;
  /** Per section and channel: s1, s2. */
  private readonly state: Float64Array;
  private work: Float64Array;
  private output: Float32Array;

  /** `sos` rows [b0 b1 b2 a0 a1 a2] (a0 != 0, normalised here); `channels` 1 real / 2 complex. */
  constructor(sos: SosMatrix, channels: 1 | 2) {
    if (sos.length < 1) throw new RangeError('sos: at least one section is needed');
    this.channels = channels;
    this.sections = sos.length;
    this.coefficients = new Float64Array(5 * sos.length);
    sos.forEach((row, i) => {
      if (row.length !== 6 || !row.every(Number.isFinite)) throw new RangeError(`sos[${i}]: must be 6 finite numbers`);
      const a0 = row[3];
      if (a0 === 0) throw new RangeError(`sos[${i}]: a0 must not be 0`);
      this.coefficients.set([row[0] / a0, row[1] / a0, row[2] / a0, row[4] / a0, row[5] / a0], 5 * i);
    });
    this.state = new Float64Array(2 * channels * sos.length);
    this.work = new Float64Array(4096);
    this.output = new Float32Array(4096);
  }

  /** Forget the filter state. */
  reset(): void {
    this.state.fill(0);
  }

  /** Filter one block; returns the same number of values (owned by this object until the next call). */
  process(input: Float32Array): Float32Array {
    const ch = this.channels;
    if (input.length % ch !== 0) throw new RangeError(`input: ${input.length} values is not a whole number of complex samples`);
    if (this.work.length < input.length) {
      this.work = new Float64Array(input.length);
      this.output = new Float32Array(input.length);
    }
    const x = this.work;
    const len = input.length;
    for (let i = 0; i < len; i++) x[i] = input[i];
    const c = this.coefficients;
    const st = this.state;
    for (let s = 0; s < this.sections; s++) {
      const b0 = c[5 * s];
      const b1 = c[5 * s + 1];
      const b2 = c[5 * s + 2];
      const a1 = c[5 * s + 3];
      const a2 = c[5 * s + 4];
      for (let k = 0; k < ch; k++) {
        const si = 2 * (s * ch + k);
        let s1 = st[si];
        let s2 = st[si + 1];
        for (let i = k; i < len; i += ch) {
          const v = x[i];
          const y = b0 * v + s1;
          s1 = b1 * v - a1 * y + s2;
          s2 = b2 * v - a2 * y;
          x[i] = y;
        }
        st[si] = s1;
        st[si + 1] = s2;
      }
    }
    const out = this.output;
    for (let i = 0; i < len; i++) out[i] = x[i];
    return out.subarray(0, len);
  }
}
