/**
 * Streaming spectrogram with a bounded image: at most `maxRows` time rows and fftSize (complex) or
 * fftSize/2 + 1 (real) frequency columns, however long the stream.
 *
 * Row merging needs no knowledge of the stream length: each row starts as the power of one segment.
 * Whenever the rows fill up to maxRows, neighbouring rows are merged in pairs (power averaged,
 * weighted by the segments each holds) and from then on each row collects twice as many segments.
 * So every finished row averages the same number of consecutive segments (a power of two), only the
 * last row may hold fewer, and the result does not depend on how the stream was split into blocks.
 * Levels use the same scaling as scipy.signal.spectrogram (mode 'psd', detrend=False).
 */
import type { SpectrogramResult } from '../types';
import { hopSize, SegmentPeriodogram, type SpectralSampleType } from './periodogram';
import { checkedScaling, levelUnit, powerToDb, segmentPowerScale, type SpectralScaling } from './levels';
import { assertSampleRate, spectralFrequencies, toDisplayOrder } from './axis';
import { resolveWindow, type SegmentAnalysisOptions } from './welch';

/** Options of a spectrogram. */
export interface SpectrogramOptions extends SegmentAnalysisOptions {
  /** Most time rows kept (>= 2). Default 256. */
  maxRows?: number;
}

interface Row {
  power: Float64Array;
  /** Segments summed into `power`. */
  count: number;
  /** Index of the first segment of the row. */
  firstSegment: number;
}

export class SpectrogramAccumulator {
  readonly sampleRate: number;
  readonly sampleType: SpectralSampleType;
  readonly fftSize: number;
  readonly maxRows: number;
  readonly scaling: SpectralScaling;
  private readonly window: Float64Array;
  private readonly periodogram: SegmentPeriodogram;
  private readonly rows: Row[] = [];
  private current: Row | null = null;
  /** Segments each full row collects (doubles at every merge). */
  private segmentsPerRow = 1;
  private readonly spare: Float64Array[] = [];
  private readonly addSegment: (spectrum: Float64Array) => void;

  constructor(options: SpectrogramOptions) {
    assertSampleRate(options.sampleRate);
    const maxRows = options.maxRows ?? 256;
    if (!Number.isInteger(maxRows) || maxRows < 2) throw new RangeError(`maxRows: must be an integer >= 2, got ${maxRows}`);
    this.sampleRate = options.sampleRate;
    this.sampleType = options.sampleType;
    this.fftSize = options.fftSize;
    this.maxRows = maxRows;
    this.scaling = checkedScaling(options.scaling);
    this.window = resolveWindow(options.window, options.fftSize, options.beta);
    this.periodogram = new SegmentPeriodogram(options.sampleType, this.window, hopSize(options.fftSize, options.overlap ?? 0.5));
    this.addSegment = (power) => this.add(power);
  }

  /** Consume a block (interleaved I/Q for complex); segments may straddle blocks. */
  push(block: Float32Array): void {
    this.periodogram.push(block, this.addSegment);
  }

  /** Segments seen so far. */
  get segments(): number {
    return this.periodogram.segments;
  }

  /** Segments averaged into each full row (a power of two). */
  get rowSegments(): number {
    return this.segmentsPerRow;
  }

  private add(spec: Float64Array): void {
    const segmentIndex = this.periodogram.segments - 1;
    if (!this.current) {
      const buffer = this.spare.pop() ?? new Float64Array(this.periodogram.bins);
      buffer.fill(0);
      this.current = { power: buffer, count: 0, firstSegment: segmentIndex };
    }
    const acc = this.current.power;
    for (let k = 0, j = 0; k < acc.length; k++, j += 2) acc[k] += spec[j] * spec[j] + spec[j + 1] * spec[j + 1];
    this.current.count++;
    if (this.current.count < this.segmentsPerRow) return;
    this.rows.push(this.current);
    this.current = null;
    if (this.rows.length === this.maxRows) this.mergePairs();
  }

  private mergePairs(): void {
    const merged: Row[] = [];
    for (let r = 0; r + 1 < this.rows.length; r += 2) {
      const a = this.rows[r];
      const b = this.rows[r + 1];
      for (let k = 0; k < a.power.length; k++) a.power[k] += b.power[k];
      a.count += b.count;
      this.spare.push(b.power);
      merged.push(a);
    }
    this.segmentsPerRow *= 2;
    // An odd row out keeps collecting segments as the row in progress.
    if (this.rows.length % 2 === 1) this.current = this.rows[this.rows.length - 1];
    this.rows.length = 0;
    this.rows.push(...merged);
  }

  /** The image: rows of levels in dB (row = time, column = frequency in display order). */
  result(calibrationDb = 0): SpectrogramResult {
    if (!Number.isFinite(calibrationDb)) throw new RangeError(`calibrationDb: must be a finite number of dB, got ${calibrationDb}`);
    const all = this.current ? [...this.rows, this.current] : this.rows;
    const baseScale = segmentPowerScale(this.window, this.sampleRate, this.scaling);
    const display = new Float64Array(this.periodogram.bins);
    const levels: number[][] = [];
    const times: number[] = [];
    for (const row of all) {
      toDisplayOrder(row.power, this.sampleType, this.fftSize, display);
      const scale = baseScale / row.count;
      const line = new Array<number>(display.length);
      for (let k = 0; k < display.length; k++) {
        const doubled = this.sampleType === 'real' && k > 0 && k < display.length - 1 ? 2 : 1;
        line[k] = powerToDb(display[k] * scale * doubled, calibrationDb);
      }
      levels.push(line);
      // Stamped at the centre of the samples the row covers (as scipy.signal.spectrogram stamps
      // segment centres): first segment's centre to last segment's centre, mid-way.
      const centreSample = (row.firstSegment + (row.count - 1) / 2) * this.periodogram.hop + this.fftSize / 2;
      times.push(centreSample / this.sampleRate);
    }
    return {
      times,
      frequencies: Array.from(spectralFrequencies(this.sampleType, this.fftSize, this.sampleRate)),
      levels,
      unit: levelUnit(this.scaling, calibrationDb),
    };
  }
}
