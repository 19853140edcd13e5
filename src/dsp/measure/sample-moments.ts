/**
 * Streaming first and second moments of a real or complex stream, for DC offset and the blind
 * I/Q imbalance estimate without keeping the samples.
 *
 * Sums are taken about the first sample seen (a shifted-data variance): a large DC offset then
 * does not swamp the small second moments through cancellation.
 */
import { imbalanceFromMoments, type IqImbalanceEstimate } from './iq-imbalance';

export class SampleMoments {
  private readonly complex: boolean;
  private count = 0;
  private shiftI = 0;
  private shiftQ = 0;
  private sumI = 0;
  private sumQ = 0;
  private sumII = 0;
  private sumQQ = 0;
  private sumIQ = 0;

  /** `complex`: interleaved I/Q blocks; otherwise one real value per sample. */
  constructor(complex: boolean) {
    this.complex = complex;
  }

  /** Consume one block. */
  push(block: Float32Array): void {
    if (block.length === 0) return;
    if (this.complex && block.length % 2 !== 0) throw new RangeError(`block: length ${block.length} is not a whole number of complex samples`);
    if (this.count === 0) {
      this.shiftI = block[0];
      this.shiftQ = this.complex ? block[1] : 0;
    }
    let si = 0;
    let sq = 0;
    let sii = 0;
    let sqq = 0;
    let siq = 0;
    if (this.complex) {
      for (let k = 0; k < block.length; k += 2) {
        const i = block[k] - this.shiftI;
        const q = block[k + 1] - this.shiftQ;
        si += i;
        sq += q;
        sii += i * i;
        sqq += q * q;
        siq += i * q;
      }
      this.count += block.length / 2;
    } else {
      for (let k = 0; k < block.length; k++) {
        const i = block[k] - this.shiftI;
        si += i;
        sii += i * i;
      }
      this.count += block.length;
    }
    this.sumI += si;
    this.sumQ += sq;
    this.sumII += sii;
    this.sumQQ += sqq;
    this.sumIQ += siq;
  }

  /** Samples consumed. */
  get samples(): number {
    return this.count;
  }

  /** Mean of I (or of the real values) and of Q (0 for real), full scale 1.0. */
  means(): { dcI: number; dcQ: number } {
    if (this.count === 0) throw new RangeError('samples: none received, so no DC offset');
    return { dcI: this.shiftI + this.sumI / this.count, dcQ: this.shiftQ + this.sumQ / this.count };
  }

  /** Mean square of I (or the real values) and of Q after their means are removed. */
  centredPowers(): { ii: number; qq: number } {
    if (this.count === 0) throw new RangeError('samples: none received, so no power');
    const mi = this.sumI / this.count;
    const mq = this.sumQ / this.count;
    return { ii: Math.max(0, this.sumII / this.count - mi * mi), qq: Math.max(0, this.sumQQ / this.count - mq * mq) };
  }

  /** Blind gain/phase imbalance (Ellingson 2003) of everything pushed; complex streams only. */
  imbalance(): IqImbalanceEstimate {
    if (!this.complex) throw new RangeError('sampleType: I/Q imbalance needs a complex stream');
    const { dcI, dcQ } = this.means();
    const n = this.count;
    const mi = this.sumI / n;
    const mq = this.sumQ / n;
    // Centred moments from the shifted sums.
    const ii = this.sumII / n - mi * mi;
    const qq = this.sumQQ / n - mq * mq;
    const iq = this.sumIQ / n - mi * mq;
    return imbalanceFromMoments(ii, qq, iq, dcI, dcQ);
  }
}

/** A DC level in dBFS: 20 log10 |mean| (0 dBFS = 1.0), floored at -300 dBFS for an exact 0. */
export function dcLevelDbfs(mean: number): number {
  return mean !== 0 ? Math.max(-300, 20 * Math.log10(Math.abs(mean))) : -300;
}
