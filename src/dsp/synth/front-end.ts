/**
 * Receiver front-end and converter impairments applied to the summed signal, then conversion to
 * the float32 block of the capture's layout.
 *
 * I/Q imbalance model: with gain ratio a = 10^(gainImbalance/20) and phase error p,
 *   I' = sqrt(a) I,   Q' = (Q cos p + I sin p) / sqrt(a).
 * The ratio of I to Q amplitude is a and the Q channel's LO is off by p, which is the model whose
 * inverse is Ellingson's correction (CHECKS.md); a tone at +f then leaves an image at -f with the
 * image rejection ratio (1 + 2 a cos p + a^2) / (1 - 2 a cos p + a^2). Splitting the gain as
 * sqrt(a) on each channel keeps the total power of a balanced signal.
 *
 * ADC model: clip at full scale, then round to the nearest of 2^N codes with step 2^-(N-1) (the
 * full-scale convention of src/dsp/formats/full-scale.ts), codes from -1 to 1 - 2^-(N-1).
 */
import type { SynthImpairments, SynthLayout } from './spec';

export class FrontEnd {
  private readonly layout: SynthLayout;
  private readonly gainI: number;
  private readonly gainQ: number;
  private readonly crossQ: number;
  private readonly directQ: number;
  private readonly dcI: number;
  private readonly dcQ: number;
  private readonly quantise: boolean;
  private readonly codesPerUnit: number;
  private readonly clip: boolean;
  private clipped = 0;

  constructor(impairments: SynthImpairments, layout: SynthLayout) {
    this.layout = layout;
    const a = 10 ** (impairments.gainImbalance / 20);
    const p = (impairments.phaseImbalance * Math.PI) / 180;
    this.gainI = Math.sqrt(a);
    this.gainQ = 1 / Math.sqrt(a);
    this.crossQ = Math.sin(p) * this.gainQ;
    this.directQ = Math.cos(p) * this.gainQ;
    this.dcI = impairments.dcOffsetI;
    this.dcQ = impairments.dcOffsetQ;
    this.quantise = impairments.adcBits > 0;
    this.codesPerUnit = this.quantise ? 2 ** (impairments.adcBits - 1) : 1;
    this.clip = impairments.clip;
  }

  /** Values that hit full scale so far. */
  get clippedValues(): number {
    return this.clipped;
  }

  /**
   * Apply the impairments to `count` samples of re/im and write them in layout order into `out`
   * from sample `offset` (value index offset or 2 * offset).
   */
  convert(re: Float64Array, im: Float64Array, count: number, out: Float32Array, offset: number): void {
    if (this.layout === 'real') {
      for (let k = 0; k < count; k++) out[offset + k] = this.adc(re[k] + this.dcI);
      return;
    }
    const gi = this.gainI;
    const cq = this.crossQ;
    const dq = this.directQ;
    let j = 2 * offset;
    for (let k = 0; k < count; k++) {
      const i = re[k];
      const q = im[k];
      out[j++] = this.adc(gi * i + this.dcI);
      out[j++] = this.adc(dq * q + cq * i + this.dcQ);
    }
  }

  private adc(x: number): number {
    if (this.quantise) {
      const scale = this.codesPerUnit;
      let code = Math.round(x * scale);
      if (this.clip) {
        if (code > scale - 1) {
          code = scale - 1;
          this.clipped++;
        } else if (code < -scale) {
          code = -scale;
          this.clipped++;
        }
      }
      return code / scale;
    }
    if (this.clip) {
      if (x > 1) {
        this.clipped++;
        return 1;
      }
      if (x < -1) {
        this.clipped++;
        return -1;
      }
    }
    return x;
  }
}
