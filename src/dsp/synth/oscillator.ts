/**
 * Complex oscillator e^{j 2 pi (f n + phase)} for the synthesizer, exact at fixed anchors.
 *
 * Calling sin/cos for every sample of every component is the slow part of synthesis; a recursive
 * rotation is fast but drifts and, restarted at block edges, would make the output depend on the
 * block size. This oscillator recomputes the phasor from the phase every ANCHOR_INTERVAL samples
 * of the absolute sample index and rotates in between, so the samples depend only on their index:
 * any block split gives the same values, and the rotation error stays below ~1e-13.
 */

/** Samples between exact recomputations of the phasor (a power of two keeps f * interval exact). */
export const ANCHOR_INTERVAL = 1024;

const TWO_PI = 2 * Math.PI;

/** Fractional part in [0, 1), also for negative input. */
function fraction(x: number): number {
  return x - Math.floor(x);
}

/** A streaming complex oscillator; fills consecutive samples starting at sample index 0. */
export class Oscillator {
  private readonly stepRe: number;
  private readonly stepIm: number;
  /** Phase advance (cycles, in [0, 1)) from one anchor to the next. */
  private readonly anchorStep: number;
  /** Phase (cycles) at the next anchor. */
  private anchorPhase: number;
  private countdown = 0;
  private re = 1;
  private im = 0;

  /** Frequency in cycles per sample (Hz / sample rate) and start phase in cycles. */
  constructor(cyclesPerSample: number, startPhaseCycles = 0) {
    if (!Number.isFinite(cyclesPerSample)) throw new RangeError(`cyclesPerSample: must be finite, got ${cyclesPerSample}`);
    if (!Number.isFinite(startPhaseCycles)) throw new RangeError(`startPhaseCycles: must be finite, got ${startPhaseCycles}`);
    const step = TWO_PI * fraction(cyclesPerSample);
    this.stepRe = Math.cos(step);
    this.stepIm = Math.sin(step);
    this.anchorStep = fraction(cyclesPerSample * ANCHOR_INTERVAL);
    this.anchorPhase = fraction(startPhaseCycles);
  }

  /** Write the next `count` samples' real and imaginary parts into `re` and `im` from index 0. */
  fill(re: Float64Array, im: Float64Array, count: number): void {
    let r = this.re;
    let i = this.im;
    let countdown = this.countdown;
    const cr = this.stepRe;
    const ci = this.stepIm;
    for (let k = 0; k < count; k++) {
      if (countdown === 0) {
        const phase = TWO_PI * this.anchorPhase;
        r = Math.cos(phase);
        i = Math.sin(phase);
        this.anchorPhase = fraction(this.anchorPhase + this.anchorStep);
        countdown = ANCHOR_INTERVAL;
      }
      re[k] = r;
      im[k] = i;
      countdown--;
      const next = r * cr - i * ci;
      i = r * ci + i * cr;
      r = next;
    }
    this.re = r;
    this.im = i;
    this.countdown = countdown;
  }
}
