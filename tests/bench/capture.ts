/**
 * Deterministic benchmark capture: complex float32 (cf32_le) at 10 Msps holding a tone at
 * +1.3 MHz (amplitude 0.5) plus complex Gaussian noise (standard deviation 0.01 per component),
 * written as a SigMF pair in blocks so that even 2^27 samples never sit in memory at once.
 */
import { openSync, writeSync, closeSync, writeFileSync } from 'node:fs';
import { formatSigmfMeta } from '../../src/dsp/formats/index';

export const BENCH_SAMPLE_RATE = 10e6;
export const BENCH_TONE_HZ = 1.3e6;

/** Small deterministic PRNG (mulberry32): the capture is the same on every machine. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Write BASE.sigmf-data and BASE.sigmf-meta with `samples` complex samples. */
export function writeBenchCapture(base: string, samples: number, seed = 2024): void {
  const random = mulberry32(seed);
  const blockSamples = 1 << 16;
  const block = new Float32Array(2 * blockSamples);
  const bytes = new Uint8Array(block.buffer);
  const fd = openSync(`${base}.sigmf-data`, 'w');
  const step = BENCH_TONE_HZ / BENCH_SAMPLE_RATE; // cycles per sample
  try {
    for (let start = 0; start < samples; start += blockSamples) {
      const n = Math.min(blockSamples, samples - start);
      for (let k = 0; k < n; k++) {
        const cycles = ((start + k) * step) % 1; // exact in float64 for any capture length here
        const phase = 2 * Math.PI * cycles;
        // Box-Muller: two independent Gaussian values per pair of uniforms.
        const r = 0.01 * Math.sqrt(-2 * Math.log(1 - random()));
        const t = 2 * Math.PI * random();
        block[2 * k] = 0.5 * Math.cos(phase) + r * Math.cos(t);
        block[2 * k + 1] = 0.5 * Math.sin(phase) + r * Math.sin(t);
      }
      writeSync(fd, bytes, 0, n * 8);
    }
  } finally {
    closeSync(fd);
  }
  writeFileSync(`${base}.sigmf-meta`, formatSigmfMeta({
    global: { datatype: 'cf32_le', version: '1.2.0', sampleRate: BENCH_SAMPLE_RATE, description: `benchmark capture: tone at +${BENCH_TONE_HZ} Hz plus noise, seed ${seed}` },
    captures: [{ sampleStart: 0, frequency: 0 }],
    annotations: [],
  }));
}
