/** Shared helpers for the formats tests: deterministic random numbers and random byte splits. */

/** Small deterministic PRNG (mulberry32) so failures reproduce. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Cut `bytes` into consecutive blocks of random sizes 0..maxBlock (empty blocks included). */
export function randomSplit(bytes: Uint8Array, random: () => number, maxBlock = 37): Uint8Array[] {
  const blocks: Uint8Array[] = [];
  let p = 0;
  while (p < bytes.length) {
    const n = Math.floor(random() * (maxBlock + 1));
    // Copy into a fresh buffer at an odd offset so unaligned paths are exercised too.
    const holder = new Uint8Array(n + 1);
    holder.set(bytes.subarray(p, p + n), 1);
    blocks.push(holder.subarray(1, 1 + Math.min(n, bytes.length - p)));
    p += n;
  }
  return blocks;
}

/** Join float blocks into one array. */
export function concatFloat(blocks: Float32Array[]): Float32Array {
  const out = new Float32Array(blocks.reduce((n, b) => n + b.length, 0));
  let p = 0;
  for (const b of blocks) { out.set(b, p); p += b.length; }
  return out;
}

/** Join byte blocks into one array. */
export function concatBytes(blocks: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(blocks.reduce((n, b) => n + b.length, 0));
  let p = 0;
  for (const b of blocks) { out.set(b, p); p += b.length; }
  return out;
}
