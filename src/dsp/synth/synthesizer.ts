/**
 * Streaming capture synthesizer: a validated spec in, float32 blocks of the capture's layout out,
 * with memory that does not grow with the capture's length. Every sample depends only on the spec
 * and its index, so any sequence of block sizes gives the same samples, and the same spec gives the
 * same samples on every run (see prng.ts for the one cross-engine caveat; Math.sin and Math.cos
 * are likewise exact within one JavaScript engine, not necessarily across engines).
 */
import type { ChainIssue, StreamFormat } from '../types';
import { valuesPerSample } from '../types';
import {
  AmCarrierComponent,
  DigitalCarrierComponent,
  FmCarrierComponent,
  NoiseComponent,
  ToneComponent,
  type Scratch,
  type SignalComponent,
} from './components';
import { FrontEnd } from './front-end';
import { synthSampleCount } from './spec';
import { parseSynthSpec, synthSpecWarnings, type SynthSpec } from './validate';

/** Samples computed per internal pass: bounds the working memory (about 3 MiB) whatever is asked. */
const WORK_SAMPLES = 65_536;

/** PRNG stream of the noise; carrier k uses stream CARRIER_STREAM_BASE + k. */
const NOISE_STREAM = 0;
const CARRIER_STREAM_BASE = 1;

/** A running synthesis of one capture. */
export interface Synthesizer {
  /** The validated spec with defaults filled in. */
  readonly spec: SynthSpec;
  /** Format of the blocks `next` returns. */
  readonly format: StreamFormat;
  /** Samples in the whole capture. */
  readonly totalSamples: number;
  /** Samples returned so far. */
  readonly samplesGenerated: number;
  /** Values that hit full scale so far (a hint to lower the levels). */
  readonly clippedValues: number;
  /** Allowed but probably unintended settings (band folding, possible clipping). */
  readonly warnings: ChainIssue[];
  /**
   * Up to `maxSamples` further samples (interleaved for complex and real-pair), in a new array the
   * caller owns; null once the capture is complete.
   */
  next(maxSamples?: number): Float32Array | null;
}

/** Total noise power (linear, full scale 1) the spec asks for; 0 when noise is off. */
export function noisePower(spec: SynthSpec): number {
  const noise = spec.noise;
  if (noise.mode === 'off') return 0;
  if (noise.mode === 'total') return 10 ** (noise.level / 10);
  const levels = [...spec.tones.map((t) => t.level), ...spec.carriers.map((c) => c.level)];
  return 10 ** ((Math.max(...levels) - noise.snr) / 10);
}

function buildComponents(spec: SynthSpec): SignalComponent[] {
  const fs = spec.sampleRate;
  const offset = spec.impairments.frequencyOffset;
  const components: SignalComponent[] = [];
  for (const tone of spec.tones) components.push(new ToneComponent(tone, tone.frequency + offset, fs));
  spec.carriers.forEach((carrier, k) => {
    const f = carrier.frequency + offset;
    if (carrier.modulation === 'am') components.push(new AmCarrierComponent(carrier, f, fs));
    else if (carrier.modulation === 'fm') components.push(new FmCarrierComponent(carrier, f, fs));
    else components.push(new DigitalCarrierComponent(carrier, f, fs, spec.seed, CARRIER_STREAM_BASE + k));
  });
  const power = noisePower(spec);
  if (power > 0) {
    // Half the power per value: I and Q of complex noise, or the real sample on a sine-power scale.
    components.push(new NoiseComponent(power / 2, spec.layout !== 'real', spec.seed, NOISE_STREAM));
  }
  return components;
}

/** Start synthesizing a capture from a spec (validated here; throws SynthSpecError naming the field). */
export function createSynthesizer(input: unknown): Synthesizer {
  const spec = parseSynthSpec(input);
  const totalSamples = synthSampleCount(spec);
  const components = buildComponents(spec);
  const frontEnd = new FrontEnd(spec.impairments, spec.layout);
  const work = Math.min(WORK_SAMPLES, totalSamples);
  const re = new Float64Array(work);
  const im = new Float64Array(work);
  const scratch: Scratch = {
    carrierRe: new Float64Array(work),
    carrierIm: new Float64Array(work),
    modRe: new Float64Array(work),
    modIm: new Float64Array(work),
  };
  const values = valuesPerSample(spec.layout);
  const format: StreamFormat = { sampleRate: spec.sampleRate, sampleType: spec.layout, centerFrequency: spec.centerFrequency };
  let generated = 0;

  return {
    spec,
    format,
    totalSamples,
    warnings: synthSpecWarnings(spec),
    get samplesGenerated() {
      return generated;
    },
    get clippedValues() {
      return frontEnd.clippedValues;
    },
    next(maxSamples = WORK_SAMPLES): Float32Array | null {
      if (!Number.isInteger(maxSamples) || maxSamples < 1) {
        throw new RangeError(`maxSamples: must be an integer >= 1, got ${maxSamples}`);
      }
      const remaining = totalSamples - generated;
      if (remaining <= 0) return null;
      const count = Math.min(maxSamples, remaining);
      const out = new Float32Array(count * values);
      for (let done = 0; done < count; ) {
        const n = Math.min(work, count - done);
        re.fill(0, 0, n);
        im.fill(0, 0, n);
        for (const component of components) component.add(re, im, n, scratch);
        frontEnd.convert(re, im, n, out, done);
        done += n;
      }
      generated += count;
      return out;
    },
  };
}

/** The capture as a sequence of blocks of `blockSamples` samples (the last may be shorter). */
export function* synthesizeBlocks(input: unknown, blockSamples = WORK_SAMPLES): Generator<Float32Array, void, undefined> {
  const synth = createSynthesizer(input);
  for (let block = synth.next(blockSamples); block; block = synth.next(blockSamples)) yield block;
}

/** The whole capture in one array: for short captures (previews, tests); long ones should stream. */
export function synthesize(input: unknown): Float32Array {
  const synth = createSynthesizer(input);
  return synth.next(synth.totalSamples) ?? new Float32Array(0);
}
