/**
 * Signal components of a synthesized capture: each adds its complex samples s(t) e^{j 2 pi f t}
 * into float64 accumulators, block after block, from sample index 0. The real layout keeps only
 * the real part. Every random choice comes from the component's own PRNG stream, so adding a tone
 * does not change the noise or the symbols of another carrier.
 */
import { constellation, type DigitalModulation } from './constellation';
import { Oscillator } from './oscillator';
import { GaussianSource, Xoshiro128 } from './prng';
import { PulseTable } from './pulse-shape';
import type { SynthCarrier, SynthDigitalCarrier, SynthTone } from './spec';

/** Working arrays shared by all components, at least as long as the largest block. */
export interface Scratch {
  carrierRe: Float64Array;
  carrierIm: Float64Array;
  modRe: Float64Array;
  modIm: Float64Array;
}

/** One additive part of the signal. */
export interface SignalComponent {
  /** Add the next `count` samples into `re` and `im` (index 0 onwards). */
  add(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void;
}

/** Amplitude (linear, full scale 1) of a level in dBFS. */
export function dbfsToAmplitude(level: number): number {
  return 10 ** (level / 20);
}

/** A continuous-wave tone A e^{j (2 pi f t + phase)}. */
export class ToneComponent implements SignalComponent {
  private readonly oscillator: Oscillator;
  private readonly amplitude: number;

  /** Tone at `frequency` Hz (offset already included) for sample rate `sampleRate` Hz. */
  constructor(tone: SynthTone, frequency: number, sampleRate: number) {
    this.oscillator = new Oscillator(frequency / sampleRate, tone.phase / 360);
    this.amplitude = dbfsToAmplitude(tone.level);
  }

  add(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void {
    const { carrierRe, carrierIm } = scratch;
    this.oscillator.fill(carrierRe, carrierIm, count);
    const a = this.amplitude;
    for (let k = 0; k < count; k++) {
      re[k] += a * carrierRe[k];
      im[k] += a * carrierIm[k];
    }
  }
}

/**
 * BPSK / QPSK / 16-QAM: s(t) = A sum_k a_k p(t Rs - k) with p the root-raised-cosine pulse. Symbols
 * start before t = 0 (k from -span/2) so the capture begins in steady state, not with a ramp.
 */
export class DigitalCarrierComponent implements SignalComponent {
  private readonly oscillator: Oscillator;
  private readonly amplitude: number;
  private readonly pulse: PulseTable;
  /** Symbols per sample. */
  private readonly symbolsPerSample: number;
  private readonly points: Float64Array;
  private readonly bitShift: number;
  private readonly random: Xoshiro128;
  private readonly ringSize: number;
  private readonly ringRe: Float64Array;
  private readonly ringIm: Float64Array;
  private readonly firstSymbol: number;
  private nextSymbol: number;
  private sampleIndex = 0;

  constructor(carrier: SynthDigitalCarrier, frequency: number, sampleRate: number, seed: number, stream: number) {
    this.oscillator = new Oscillator(frequency / sampleRate, 0);
    this.amplitude = dbfsToAmplitude(carrier.level);
    this.pulse = new PulseTable(carrier.rollOff, carrier.span);
    this.symbolsPerSample = carrier.symbolRate / sampleRate;
    const c = constellation(carrier.modulation as DigitalModulation);
    this.points = c.points;
    this.bitShift = 32 - c.bitsPerSymbol;
    this.random = new Xoshiro128(seed, stream);
    // The pulse covers at most span + 1 symbols at any instant.
    let size = 4;
    while (size < carrier.span + 3) size *= 2;
    this.ringSize = size;
    this.ringRe = new Float64Array(size);
    this.ringIm = new Float64Array(size);
    this.firstSymbol = -Math.ceil(this.pulse.halfSpan);
    this.nextSymbol = this.firstSymbol;
  }

  private generateThrough(lastSymbol: number): void {
    while (this.nextSymbol <= lastSymbol) {
      const code = this.random.nextUint32() >>> this.bitShift;
      const slot = (this.nextSymbol - this.firstSymbol) % this.ringSize;
      this.ringRe[slot] = this.points[2 * code];
      this.ringIm[slot] = this.points[2 * code + 1];
      this.nextSymbol++;
    }
  }

  add(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void {
    const { carrierRe, carrierIm } = scratch;
    this.oscillator.fill(carrierRe, carrierIm, count);
    const half = this.pulse.halfSpan;
    const a = this.amplitude;
    const ring = this.ringSize;
    const first = this.firstSymbol;
    const table = this.pulse.values;
    const lastIndex = table.length - 1;
    const perSymbol = this.pulse.pointsPerSymbol;
    const ringRe = this.ringRe;
    const ringIm = this.ringIm;
    for (let k = 0; k < count; k++) {
      // Time in symbol periods from the absolute sample index: no drift, same for any block split.
      const u = (this.sampleIndex + k) * this.symbolsPerSample;
      const kLow = Math.ceil(u - half);
      const kHigh = Math.floor(u + half);
      if (kHigh >= this.nextSymbol) this.generateThrough(kHigh);
      let sr = 0;
      let si = 0;
      // Walk the table from the oldest symbol (largest t) to the newest, one symbol period apart.
      let position = (u - kLow + half) * perSymbol;
      let slot = (kLow - first) % ring;
      for (let s = kLow; s <= kHigh; s++) {
        const index = Math.floor(position);
        let p = 0;
        if (index >= 0 && index < lastIndex) {
          const v0 = table[index];
          p = v0 + (position - index) * (table[index + 1] - v0);
        }
        sr += p * ringRe[slot];
        si += p * ringIm[slot];
        position -= perSymbol;
        slot = slot + 1 === ring ? 0 : slot + 1;
      }
      const cr = carrierRe[k];
      const ci = carrierIm[k];
      re[k] += a * (sr * cr - si * ci);
      im[k] += a * (sr * ci + si * cr);
    }
    this.sampleIndex += count;
  }
}

/** A carrier modulated by one tone (AM, FM): both oscillators filled here, s(t) by each modulation. */
abstract class ToneModulatedCarrier implements SignalComponent {
  private readonly carrier: Oscillator;
  private readonly modulator: Oscillator;
  /** Unmodulated carrier amplitude (linear, full scale 1). */
  protected readonly amplitude: number;

  /** Carrier at `frequency` Hz, modulating tone at `toneFrequency` Hz, level in dBFS, rate in Hz. */
  constructor(level: number, frequency: number, toneFrequency: number, sampleRate: number) {
    this.carrier = new Oscillator(frequency / sampleRate, 0);
    this.modulator = new Oscillator(toneFrequency / sampleRate, 0);
    this.amplitude = dbfsToAmplitude(level);
  }

  add(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void {
    this.carrier.fill(scratch.carrierRe, scratch.carrierIm, count);
    this.modulator.fill(scratch.modRe, scratch.modIm, count);
    this.modulate(re, im, count, scratch);
  }

  /** Add `count` samples, given the carrier (carrierRe/Im) and modulating tone (modRe/Im) in `scratch`. */
  protected abstract modulate(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void;
}

/** AM by a tone: s(t) = A (1 + depth cos(2 pi fm t)); A is the unmodulated carrier's amplitude. */
export class AmCarrierComponent extends ToneModulatedCarrier {
  private readonly depth: number;

  constructor(spec: Extract<SynthCarrier, { modulation: 'am' }>, frequency: number, sampleRate: number) {
    super(spec.level, frequency, spec.toneFrequency, sampleRate);
    this.depth = spec.depth;
  }

  protected modulate(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void {
    const { carrierRe, carrierIm, modRe } = scratch;
    const a = this.amplitude;
    const m = this.depth;
    for (let k = 0; k < count; k++) {
      const envelope = a * (1 + m * modRe[k]);
      re[k] += envelope * carrierRe[k];
      im[k] += envelope * carrierIm[k];
    }
  }
}

/** FM by a tone: s(t) = A exp(j beta sin(2 pi fm t)), beta = deviation / fm (constant envelope). */
export class FmCarrierComponent extends ToneModulatedCarrier {
  private readonly index: number;

  constructor(spec: Extract<SynthCarrier, { modulation: 'fm' }>, frequency: number, sampleRate: number) {
    super(spec.level, frequency, spec.toneFrequency, sampleRate);
    this.index = spec.deviation / spec.toneFrequency;
  }

  protected modulate(re: Float64Array, im: Float64Array, count: number, scratch: Scratch): void {
    const { carrierRe, carrierIm, modIm } = scratch;
    const a = this.amplitude;
    const beta = this.index;
    for (let k = 0; k < count; k++) {
      const phase = beta * modIm[k];
      const sr = a * Math.cos(phase);
      const si = a * Math.sin(phase);
      const cr = carrierRe[k];
      const ci = carrierIm[k];
      re[k] += sr * cr - si * ci;
      im[k] += sr * ci + si * cr;
    }
  }
}

/** White Gaussian noise with variance `perValueVariance` on every value (I and Q, or the real sample). */
export class NoiseComponent implements SignalComponent {
  private readonly source: GaussianSource;
  private readonly sigma: number;
  private readonly complex: boolean;

  constructor(perValueVariance: number, complex: boolean, seed: number, stream: number) {
    this.source = new GaussianSource(seed, stream);
    this.sigma = Math.sqrt(perValueVariance);
    this.complex = complex;
  }

  add(re: Float64Array, im: Float64Array, count: number): void {
    const sigma = this.sigma;
    const source = this.source;
    if (this.complex) {
      for (let k = 0; k < count; k++) {
        re[k] += sigma * source.next();
        im[k] += sigma * source.next();
      }
    } else {
      for (let k = 0; k < count; k++) re[k] += sigma * source.next();
    }
  }
}
