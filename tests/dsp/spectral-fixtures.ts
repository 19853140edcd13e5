/** Loads the SciPy/numpy reference vectors written by tests/reference/gen_spectral.py. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export function loadSpectralFixture<T>(name: string): T & { versions: { numpy: string; scipy: string } } {
  const url = new URL(`../reference/fixtures/spectral/${name}`, import.meta.url);
  return JSON.parse(readFileSync(fileURLToPath(url), 'utf8'));
}

/** Largest |a - b| over two equally long sequences. */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) throw new Error(`length ${a.length} != ${b.length}`);
  let worst = 0;
  for (let k = 0; k < a.length; k++) worst = Math.max(worst, Math.abs(a[k] - b[k]));
  return worst;
}

/** Largest |x| of a sequence. */
export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]));
  return m;
}

/** Deterministic uniform random numbers (mulberry32) so tests repeat exactly. */
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

/** Standard normal deviates from a uniform source (Box-Muller). */
export function gaussian(random: () => number): () => number {
  return () => {
    const u = 1 - random();
    const v = random();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

/** Splits `data` into blocks of random lengths that are multiples of `step` values. */
export function randomBlocks(data: Float32Array, step: number, seed: number, maxSamples = 700): Float32Array[] {
  const random = seededRandom(seed);
  const blocks: Float32Array[] = [];
  let offset = 0;
  while (offset < data.length) {
    const samples = Math.floor(random() * maxSamples);
    const end = Math.min(data.length, offset + samples * step);
    blocks.push(data.slice(offset, end));
    offset = end;
  }
  return blocks;
}
