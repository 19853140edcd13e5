/**
 * Numerically controlled oscillator e^{j(2 pi f n / fs + phase)} that keeps its phase exactly over
 * any stream length.
 *
 * A recursive rotator (z *= e^{jw}) drifts in amplitude and phase, and a float32 phase accumulator
 * loses precision within seconds. Here the oscillator value of sample n is base(chunk) * table[k]
 * with n = chunk * CHUNK + k: `table` holds e^{j 2 pi f k / fs} for one chunk, computed once, and
 * `base` is recomputed with cos/sin from the exact phase at the start of every chunk. When f and fs
 * are (decimal) integers, that chunk phase is an integer counter modulo fs, so it is exact at any
 * sample index; otherwise it is a float64 cycle count wrapped into [0, 1) at every chunk, whose
 * error stays below 1e-10 cycles over 2^27 samples. Chunks are aligned on absolute sample indices,
 * so the output does not depend on how the stream is cut into blocks. When f/fs is a fraction whose
 * period is short (e.g. -1.25 MHz at 10 MHz repeats every 8 samples), the whole period is one exact
 * table indexed by the sample counter modulo the period.
 */

const CHUNK = 1024;
const TWO_PI = 2 * Math.PI;
/** Longest period (samples) kept as a whole table: one complex multiply per sample instead of two. */
const MAX_PERIOD_TABLE = 16_384;

function greatestCommonDivisor(a: number, b: number): number {
  while (b !== 0) [a, b] = [b, a % b];
  return a;
}

/** Exact integer form of f/fs (f mod fs and fs, both scaled to integers), or null when there is none. */
function integerRatio(frequency: number, sampleRate: number): { step: number; modulus: number } | null {
  for (const scale of [1, 10, 100, 1000]) {
    const f = frequency * scale;
    const s = sampleRate * scale;
    const fi = Math.round(f);
    const si = Math.round(s);
    const close = (x: number, xi: number) => Math.abs(x - xi) <= 1e-9 * Math.max(1, Math.abs(x));
    // CHUNK * modulus must stay below 2^53 so that every counter product is exact.
    if (close(f, fi) && close(s, si) && si > 0 && si <= 2 ** 40) {
      return { step: ((fi % si) + si) % si, modulus: si };
    }
  }
  return null;
}

/** Fractional part in [0, 1). */
function fraction(x: number): number {
  return x - Math.floor(x);
}

/** Oscillator e^{j(2 pi f n / fs + phase)} applied sample by sample; state survives between blocks. */
export class Nco {
  private readonly tableRe = new Float64Array(CHUNK);
  private readonly tableIm = new Float64Array(CHUNK);
  private readonly ratio: { step: number; modulus: number } | null;
  /** Integer path: chunk start phase as a count modulo `ratio.modulus`. */
  private chunkCount = 0;
  private readonly chunkCountStep: number;
  /** Float path: chunk start phase in cycles, in [0, 1). */
  private chunkCycles = 0;
  private readonly chunkCyclesStep: number;
  private baseRe = 1;
  private baseIm = 0;
  /** Index within the current chunk; CHUNK means "start a new chunk before the next sample". */
  private k = CHUNK;
  private started = false;
  /** Whole-period tables (with the initial phase) when the period is short, else null. */
  private readonly periodRe: Float64Array | null = null;
  private readonly periodIm: Float64Array | null = null;
  /** Sample counter modulo the period. */
  private m = 0;

  /** Oscillator at `frequency` Hz (any sign) for a stream at `sampleRate` Hz, starting at `phaseRad` radians. */
  constructor(
    frequency: number,
    sampleRate: number,
    private readonly phaseRad: number,
  ) {
    if (!(sampleRate > 0) || !Number.isFinite(sampleRate)) throw new RangeError(`sampleRate: must be a finite number > 0 Hz, got ${sampleRate}`);
    if (!Number.isFinite(frequency)) throw new RangeError(`frequency: must be a finite number of Hz, got ${frequency}`);
    if (!Number.isFinite(phaseRad)) throw new RangeError(`phase: must be a finite number, got ${phaseRad}`);
    this.ratio = integerRatio(frequency, sampleRate);
    const cyclesPerSample = frequency / sampleRate;
    for (let k = 0; k < CHUNK; k++) {
      const cycles = this.ratio ? ((k * this.ratio.step) % this.ratio.modulus) / this.ratio.modulus : fraction(k * cyclesPerSample);
      this.tableRe[k] = Math.cos(TWO_PI * cycles);
      this.tableIm[k] = Math.sin(TWO_PI * cycles);
    }
    this.chunkCountStep = this.ratio ? (CHUNK * this.ratio.step) % this.ratio.modulus : 0;
    this.chunkCyclesStep = fraction(CHUNK * cyclesPerSample);
    if (this.ratio) {
      const { step, modulus } = this.ratio;
      const period = modulus / greatestCommonDivisor(step, modulus);
      if (period <= MAX_PERIOD_TABLE) {
        this.periodRe = new Float64Array(period);
        this.periodIm = new Float64Array(period);
        for (let m = 0; m < period; m++) {
          const angle = (TWO_PI * ((m * step) % modulus)) / modulus + phaseRad;
          this.periodRe[m] = Math.cos(angle);
          this.periodIm[m] = Math.sin(angle);
        }
      }
    }
  }

  private nextChunk(): void {
    if (this.started) {
      if (this.ratio) {
        this.chunkCount += this.chunkCountStep;
        if (this.chunkCount >= this.ratio.modulus) this.chunkCount -= this.ratio.modulus;
      } else {
        this.chunkCycles += this.chunkCyclesStep;
        if (this.chunkCycles >= 1) this.chunkCycles -= 1;
      }
    }
    this.started = true;
    const cycles = this.ratio ? this.chunkCount / this.ratio.modulus : this.chunkCycles;
    const angle = TWO_PI * cycles + this.phaseRad;
    this.baseRe = Math.cos(angle);
    this.baseIm = Math.sin(angle);
    this.k = 0;
  }

  /** output = input * oscillator for interleaved complex blocks; output may be the input array. */
  mixComplex(input: Float32Array, output: Float32Array): void {
    const samples = input.length >> 1;
    if (this.periodRe && this.periodIm) {
      const pRe = this.periodRe;
      const pIm = this.periodIm;
      const period = pRe.length;
      let m = this.m;
      for (let n = 0; n < samples; n++) {
        const cRe = pRe[m];
        const cIm = pIm[m];
        const xRe = input[2 * n];
        const xIm = input[2 * n + 1];
        output[2 * n] = xRe * cRe - xIm * cIm;
        output[2 * n + 1] = xRe * cIm + xIm * cRe;
        if (++m === period) m = 0;
      }
      this.m = m;
      return;
    }
    const tRe = this.tableRe;
    const tIm = this.tableIm;
    let n = 0;
    while (n < samples) {
      if (this.k === CHUNK) this.nextChunk();
      let k = this.k;
      const end = Math.min(samples, n + (CHUNK - k));
      const bRe = this.baseRe;
      const bIm = this.baseIm;
      for (; n < end; n++, k++) {
        const cRe = bRe * tRe[k] - bIm * tIm[k];
        const cIm = bRe * tIm[k] + bIm * tRe[k];
        const xRe = input[2 * n];
        const xIm = input[2 * n + 1];
        output[2 * n] = xRe * cRe - xIm * cIm;
        output[2 * n + 1] = xRe * cIm + xIm * cRe;
      }
      this.k = k;
    }
  }

  // mixReal repeats mixComplex's chunk walk on purpose: moving the per-sample loop into a shared
  // walker measured 10 to 30 % slower (node 20, 2^22-sample blocks), and the mix is on the hot path.
  /** output (interleaved complex, 2 values per input value) = real input * oscillator. */
  mixReal(input: Float32Array, output: Float32Array): void {
    const samples = input.length;
    if (this.periodRe && this.periodIm) {
      const pRe = this.periodRe;
      const pIm = this.periodIm;
      const period = pRe.length;
      let m = this.m;
      for (let n = 0; n < samples; n++) {
        const x = input[n];
        output[2 * n] = x * pRe[m];
        output[2 * n + 1] = x * pIm[m];
        if (++m === period) m = 0;
      }
      this.m = m;
      return;
    }
    const tRe = this.tableRe;
    const tIm = this.tableIm;
    let n = 0;
    while (n < samples) {
      if (this.k === CHUNK) this.nextChunk();
      let k = this.k;
      const end = Math.min(samples, n + (CHUNK - k));
      const bRe = this.baseRe;
      const bIm = this.baseIm;
      for (; n < end; n++, k++) {
        const x = input[n];
        output[2 * n] = x * (bRe * tRe[k] - bIm * tIm[k]);
        output[2 * n + 1] = x * (bRe * tIm[k] + bIm * tRe[k]);
      }
      this.k = k;
    }
  }
}
