/**
 * Streaming overload figures per channel: samples at or beyond full scale (|x| >= 1) and the
 * crest factor (peak over RMS; for complex streams of the magnitude |I + jQ|).
 */
export class ClippingCounter {
  private readonly complex: boolean;
  /** Samples with |x| >= 1, per channel (I, Q for complex; one entry for real). */
  readonly clipped: number[];
  private peakSquare = 0;
  private sumSquare = 0;
  private count = 0;

  /** `complex`: interleaved I/Q blocks; otherwise one real value per sample. */
  constructor(complex: boolean) {
    this.complex = complex;
    this.clipped = complex ? [0, 0] : [0];
  }

  /** Consume one block. */
  push(block: Float32Array): void {
    const step = this.complex ? 2 : 1;
    for (let k = 0; k + step <= block.length; k += step) {
      const i = block[k];
      const q = this.complex ? block[k + 1] : 0;
      if (Math.abs(i) >= 1) this.clipped[0]++;
      if (this.complex && Math.abs(q) >= 1) this.clipped[1]++;
      const m = i * i + q * q;
      if (m > this.peakSquare) this.peakSquare = m;
      this.sumSquare += m;
      this.count++;
    }
  }

  /** Samples consumed. */
  get samples(): number {
    return this.count;
  }

  /** Largest |x| (or |I + jQ|) seen, full scale 1.0. */
  get peak(): number {
    return Math.sqrt(this.peakSquare);
  }

  /** Crest factor in dB, 20 log10(peak / RMS); null without signal. */
  crestFactorDb(): number | null {
    if (this.count === 0 || !(this.sumSquare > 0)) return null;
    return 10 * Math.log10(this.peakSquare / (this.sumSquare / this.count));
  }
}
