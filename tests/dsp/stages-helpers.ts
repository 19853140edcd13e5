/** Helpers for the stage and chain tests: seeded randomness, block splitting, a direct DFT. */
import type { StageDefinition, StageProcessor, StreamFormat } from '@/dsp/types';

/** Seeded uniform generator in [0, 1) (mulberry32), so failures reproduce. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Cut `data` (whole samples of `valuesPerSample` values) into random blocks of 0..maxSamples samples. */
export function randomBlocks(data: Float32Array, valuesPerSample: number, maxSamples: number, seed: number): Float32Array[] {
  const random = seededRandom(seed);
  const blocks: Float32Array[] = [];
  let at = 0;
  while (at < data.length) {
    const samples = Math.floor(random() * (maxSamples + 1));
    const end = Math.min(data.length, at + samples * valuesPerSample);
    // Copies, so a stage that wrongly keeps a view of its input would be caught.
    blocks.push(data.slice(at, end));
    at = end;
  }
  return blocks;
}

/** Concatenate blocks into one array. */
export function concat(blocks: Float32Array[]): Float32Array {
  const out = new Float32Array(blocks.reduce((n, b) => n + b.length, 0));
  let at = 0;
  for (const b of blocks) {
    out.set(b, at);
    at += b.length;
  }
  return out;
}

/** Run a processor over blocks and return all its output (copied, since processors reuse buffers). */
export function runProcessor(processor: StageProcessor, blocks: Float32Array[]): Float32Array {
  const out: Float32Array[] = [];
  for (const block of blocks) out.push(processor.process(block).slice());
  out.push(processor.finish().slice());
  return concat(out);
}

/** Run a stage definition with params (parsed by its schema) over one capture cut into blocks. */
export function runStage<P>(definition: StageDefinition<P>, params: unknown, input: StreamFormat, blocks: Float32Array[]): Float32Array {
  const parsed = definition.schema.parse(params);
  return runProcessor(definition.create(parsed, input), blocks);
}

/** Direct DFT of interleaved complex samples at `frequency` Hz, normalised by N: a tone A e^{j 2 pi f t} gives A. */
export function dftAt(iq: ArrayLike<number>, frequency: number, sampleRate: number): { re: number; im: number; magnitude: number } {
  const n = iq.length / 2;
  let re = 0;
  let im = 0;
  const w = (-2 * Math.PI * frequency) / sampleRate;
  for (let k = 0; k < n; k++) {
    const c = Math.cos(w * k);
    const s = Math.sin(w * k);
    re += iq[2 * k] * c - iq[2 * k + 1] * s;
    im += iq[2 * k] * s + iq[2 * k + 1] * c;
  }
  re /= n;
  im /= n;
  return { re, im, magnitude: Math.hypot(re, im) };
}

/** Direct DFT of a real sequence at `frequency` Hz, normalised by N (a cosine of amplitude A gives A/2). */
export function dftRealAt(x: ArrayLike<number>, frequency: number, sampleRate: number): number {
  const iq = new Float64Array(2 * x.length);
  for (let k = 0; k < x.length; k++) iq[2 * k] = x[k];
  return dftAt(iq, frequency, sampleRate).magnitude;
}

/** Complex tone amplitude * e^{j (2 pi f n / fs + phase)}, n samples, interleaved. */
export function complexTone(n: number, frequency: number, sampleRate: number, amplitude = 1, phase = 0): Float32Array {
  const out = new Float32Array(2 * n);
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * frequency * k) / sampleRate + phase;
    out[2 * k] = amplitude * Math.cos(a);
    out[2 * k + 1] = amplitude * Math.sin(a);
  }
  return out;
}

/** Real tone amplitude * cos(2 pi f n / fs + phase), n samples. */
export function realTone(n: number, frequency: number, sampleRate: number, amplitude = 1, phase = 0): Float32Array {
  const out = new Float32Array(n);
  for (let k = 0; k < n; k++) out[k] = amplitude * Math.cos((2 * Math.PI * frequency * k) / sampleRate + phase);
  return out;
}

/** Seeded Gaussian noise (Box-Muller), `values` values of standard deviation `sigma`. */
export function gaussianNoise(values: number, sigma: number, seed: number): Float32Array {
  const random = seededRandom(seed);
  const out = new Float32Array(values);
  for (let k = 0; k < values; k += 2) {
    const r = Math.sqrt(-2 * Math.log(1 - random())) * sigma;
    const t = 2 * Math.PI * random();
    out[k] = r * Math.cos(t);
    if (k + 1 < values) out[k + 1] = r * Math.sin(t);
  }
  return out;
}

/** Bytes of two float arrays equal (bitwise identical output). */
export function sameBits(a: Float32Array, b: Float32Array): boolean {
  if (a.length !== b.length) return false;
  const x = new Uint32Array(a.buffer, a.byteOffset, a.length);
  const y = new Uint32Array(b.buffer, b.byteOffset, b.length);
  for (let k = 0; k < x.length; k++) if (x[k] !== y[k]) return false;
  return true;
}
