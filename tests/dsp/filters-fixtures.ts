/** Loads the SciPy reference vectors written by tests/reference/gen_filters.py. */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

export interface FixtureFile<C> {
  versions: { scipy: string; numpy: string };
  cases: C[];
}

/** Parsed fixture file `name` from tests/reference/fixtures/filters/. */
export function loadFilterFixture<C>(name: string): FixtureFile<C> {
  const url = new URL(`../reference/fixtures/filters/${name}`, import.meta.url);
  return JSON.parse(readFileSync(fileURLToPath(url), 'utf8')) as FixtureFile<C>;
}

/** Largest |a[i] - b[i]| / scale, scale = max |b| (or 1 when b is all zero). */
export function maxRelativeError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return Infinity;
  let scale = 0;
  for (let i = 0; i < b.length; i++) scale = Math.max(scale, Math.abs(b[i]));
  if (scale === 0) scale = 1;
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]) / scale);
  return worst;
}

/** Largest |a[i] - b[i]|. */
export function maxAbsoluteError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

/** Random block sizes (1 to max values' worth of samples) that add up to `total` samples. */
export function randomSplit(total: number, maxBlock: number, seed: number): number[] {
  let state = seed >>> 0;
  const next = () => {
    // xorshift32: deterministic so that a failure can be reproduced.
    state ^= state << 13;
    state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5;
    state >>>= 0;
    return state / 4294967296;
  };
  const sizes: number[] = [];
  let left = total;
  while (left > 0) {
    const n = Math.min(left, 1 + Math.floor(next() * maxBlock));
    sizes.push(n);
    left -= n;
  }
  return sizes;
}
