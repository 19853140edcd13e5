/**
 * What a probe keeps of a stage that measures nothing itself: a Welch spectrum (Hann, 2048 points,
 * 50 % overlap, density scaling: dBFS/Hz), a min/max trace for plotting and, for complex streams,
 * a constellation sample. Memory stays bounded however long the stream.
 */
import type { ProbeOutput, StreamFormat } from '../types';
import { MinMaxTraceReducer, WelchAccumulator } from '../spectral/index';

/** Welch segment length (samples) of a default probe. */
export const DEFAULT_PROBE_FFT_SIZE = 2048;
/** Most constellation points (complex samples) a default probe keeps. */
export const DEFAULT_PROBE_CONSTELLATION_POINTS = 2048;

/**
 * Keeps at most `capacity` complex samples spread evenly over the stream: every stride-th sample,
 * the stride doubling (and every other kept point dropped) whenever the store is full. Which samples
 * are kept depends only on their index, not on block sizes.
 */
export class ConstellationSampler {
  private readonly points: Float32Array;
  private count = 0;
  private stride = 1;
  /** Index of the next input sample. */
  private index = 0;

  constructor(private readonly capacity = DEFAULT_PROBE_CONSTELLATION_POINTS) {
    this.points = new Float32Array(2 * capacity);
  }

  /** Consume interleaved complex samples. */
  push(block: Float32Array): void {
    const samples = block.length >> 1;
    // First sample of this block whose index is a multiple of the stride.
    let n = (this.stride - (this.index % this.stride)) % this.stride;
    while (n < samples) {
      if (this.count === this.capacity) {
        for (let k = 0; 2 * k < this.count; k++) {
          this.points[2 * k] = this.points[4 * k];
          this.points[2 * k + 1] = this.points[4 * k + 1];
        }
        this.count = Math.ceil(this.count / 2);
        this.stride *= 2;
        // Sample n sits on the old stride; if it is off the new one, the next kept sample is s further.
        if ((this.index + n) % this.stride !== 0) {
          n += this.stride / 2;
          continue;
        }
      }
      this.points[2 * this.count] = block[2 * n];
      this.points[2 * this.count + 1] = block[2 * n + 1];
      this.count++;
      n += this.stride;
    }
    this.index += samples;
  }

  /** Kept points, interleaved I, Q. */
  result(): number[] {
    return Array.from(this.points.subarray(0, 2 * this.count));
  }
}

/** Default probe of a stage's output stream. */
export class DefaultProbe {
  private readonly welch: WelchAccumulator | null;
  private readonly trace: MinMaxTraceReducer;
  private readonly constellation: ConstellationSampler | null;
  private samples = 0;

  constructor(format: StreamFormat) {
    const spectral = format.sampleType === 'real' || format.sampleType === 'complex';
    this.welch = spectral
      ? new WelchAccumulator({ sampleRate: format.sampleRate, sampleType: format.sampleType as 'real' | 'complex', fftSize: DEFAULT_PROBE_FFT_SIZE, window: 'hann', overlap: 0.5, scaling: 'density' })
      : null;
    this.trace = new MinMaxTraceReducer({ sampleRate: format.sampleRate, sampleType: format.sampleType });
    this.constellation = format.sampleType === 'complex' ? new ConstellationSampler() : null;
  }

  /** Consume one block of the probed stage's output. */
  push(block: Float32Array): void {
    if (block.length === 0) return;
    this.samples += block.length;
    this.welch?.push(block);
    this.trace.push(block);
    this.constellation?.push(block);
  }

  /** Spectrum, trace and constellation of everything pushed (only the trace when nothing was). */
  result(): Omit<ProbeOutput, 'stageId' | 'kind' | 'format'> {
    const out: Omit<ProbeOutput, 'stageId' | 'kind' | 'format'> = { trace: this.trace.result() };
    if (this.welch && this.samples > 0) {
      this.welch.finish();
      out.spectrum = this.welch.result();
    }
    if (this.constellation) out.constellation = this.constellation.result();
    return out;
  }
}
