/**
 * Min/max per pixel column, so a plot of a long trace needs only 2 x columns points per channel
 * and still shows every peak.
 *
 * The streaming reducer needs no knowledge of the stream length: it starts with one sample per
 * column and, whenever maxColumns columns are full, merges neighbouring columns in pairs (min of
 * mins, max of maxes) and doubles the samples per column. Block splits do not change the result.
 */
import type { SampleType, TraceResult } from '../types';
import { valuesPerSample } from '../types';

/** Options of the streaming min/max reducer. */
export interface TraceReducerOptions {
  /** Samples per second (Hz). */
  sampleRate: number;
  sampleType: SampleType;
  /** Most columns kept (>= 2). Default 2048. */
  maxColumns?: number;
}

export class MinMaxTraceReducer {
  readonly sampleRate: number;
  readonly sampleType: SampleType;
  readonly maxColumns: number;
  private readonly channelCount: 1 | 2;
  private readonly mins: Float64Array[];
  private readonly maxs: Float64Array[];
  /** Finished columns. */
  private columns = 0;
  /** Samples in the column being filled. */
  private fill = 0;
  private perColumn = 1;

  constructor(options: TraceReducerOptions) {
    if (!Number.isFinite(options.sampleRate) || options.sampleRate <= 0) throw new RangeError(`sampleRate: must be a finite number > 0 Hz, got ${options.sampleRate}`);
    const maxColumns = options.maxColumns ?? 2048;
    if (!Number.isInteger(maxColumns) || maxColumns < 2) throw new RangeError(`maxColumns: must be an integer >= 2, got ${maxColumns}`);
    this.sampleRate = options.sampleRate;
    this.sampleType = options.sampleType;
    this.maxColumns = maxColumns;
    this.channelCount = valuesPerSample(options.sampleType);
    // One extra slot holds the column being filled.
    this.mins = Array.from({ length: this.channelCount }, () => new Float64Array(maxColumns + 1).fill(Infinity));
    this.maxs = Array.from({ length: this.channelCount }, () => new Float64Array(maxColumns + 1).fill(-Infinity));
  }

  /** Consume one block in the stream's layout. */
  push(block: Float32Array): void {
    const channels = this.channelCount;
    if (block.length % channels !== 0) throw new RangeError(`block: length ${block.length} is not a whole number of ${this.sampleType} samples`);
    let index = 0;
    while (index < block.length) {
      const col = this.columns;
      const room = this.perColumn - this.fill;
      const take = Math.min(room, (block.length - index) / channels);
      for (let c = 0; c < channels; c++) {
        let lo = this.mins[c][col];
        let hi = this.maxs[c][col];
        const end = index + take * channels;
        for (let j = index + c; j < end; j += channels) {
          const v = block[j];
          if (v < lo) lo = v;
          if (v > hi) hi = v;
        }
        this.mins[c][col] = lo;
        this.maxs[c][col] = hi;
      }
      index += take * channels;
      this.fill += take;
      if (this.fill === this.perColumn) {
        this.columns++;
        this.fill = 0;
        if (this.columns === this.maxColumns) this.mergePairs();
      }
    }
  }

  private mergePairs(): void {
    const full = this.columns;
    for (let c = 0; c < this.channelCount; c++) {
      const lo = this.mins[c];
      const hi = this.maxs[c];
      for (let k = 0; 2 * k + 1 < full; k++) {
        lo[k] = Math.min(lo[2 * k], lo[2 * k + 1]);
        hi[k] = Math.max(hi[2 * k], hi[2 * k + 1]);
      }
      const half = Math.floor(full / 2);
      if (full % 2 === 1) {
        // The odd column out becomes the column being filled, already holding perColumn samples.
        lo[half] = lo[full - 1];
        hi[half] = hi[full - 1];
      }
      lo.fill(Infinity, half + (full % 2));
      hi.fill(-Infinity, half + (full % 2));
    }
    this.fill = full % 2 === 1 ? this.perColumn : 0;
    this.columns = Math.floor(full / 2);
    this.perColumn *= 2;
  }

  /** The reduced trace; a partly filled last column is included. */
  result(): TraceResult {
    const count = this.columns + (this.fill > 0 ? 1 : 0);
    return {
      sampleRate: this.sampleRate,
      samplesPerColumn: this.perColumn,
      channels: this.mins.map((lo, c) => ({ min: Array.from(lo.subarray(0, count)), max: Array.from(this.maxs[c].subarray(0, count)) })),
    };
  }
}

/** Min/max per column of a whole trace of one channel: `columns` columns of ceil(length/columns) samples. */
export function reduceMinMax(values: ArrayLike<number>, columns: number): { samplesPerColumn: number; min: number[]; max: number[] } {
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`columns: must be an integer >= 1, got ${columns}`);
  const perColumn = Math.max(1, Math.ceil(values.length / columns));
  const min: number[] = [];
  const max: number[] = [];
  for (let start = 0; start < values.length; start += perColumn) {
    let lo = Infinity;
    let hi = -Infinity;
    const end = Math.min(values.length, start + perColumn);
    for (let j = start; j < end; j++) {
      const v = values[j];
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    min.push(lo);
    max.push(hi);
  }
  return { samplesPerColumn: perColumn, min, max };
}

/**
 * A spectrum reduced for a plot of at most `columns` points: each column keeps its highest level
 * and that bin's frequency (Hz), so narrow peaks survive at their true frequency.
 */
export function reduceSpectrumMax(
  frequencies: ArrayLike<number>,
  levels: ArrayLike<number>,
  columns: number,
): { frequencies: number[]; levels: number[] } {
  if (frequencies.length !== levels.length) throw new RangeError('levels: need one level per frequency');
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`columns: must be an integer >= 1, got ${columns}`);
  const perColumn = Math.max(1, Math.ceil(levels.length / columns));
  const outF: number[] = [];
  const outL: number[] = [];
  for (let start = 0; start < levels.length; start += perColumn) {
    let best = start;
    const end = Math.min(levels.length, start + perColumn);
    for (let j = start + 1; j < end; j++) if (levels[j] > levels[best]) best = j;
    outF.push(frequencies[best]);
    outL.push(levels[best]);
  }
  return { frequencies: outF, levels: outL };
}
