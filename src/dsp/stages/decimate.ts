/**
 * decimate: keep every `factor`-th sample. With `antiAlias` a built-in Kaiser low-pass runs first
 * (only the kept outputs are computed); without it the stream must already be band-limited below
 * the new Nyquist frequency or it aliases.
 */
import { z } from 'zod';
import type { ChainIssue, StageDefinition, StageProcessor, StreamFormat } from '../types';
import { ISSUE_CODES } from '../chain/issue-codes';
import { designFilter } from '../filters/design';
import type { FilterParams } from '../filters/filter-params';
import { FirDecimator } from '../filters/fir-decimator';
import { kaiserTaps } from '../filters/kaiser';

export const decimateSchema = z
  .object({
    factor: z.number().int().min(2).max(4096).default(2),
    antiAlias: z.boolean().default(true),
  })
  .strict();

export type DecimateParams = z.infer<typeof decimateSchema>;

/** Stop-band attenuation of the built-in anti-alias filter, dB. */
export const ANTI_ALIAS_ATTENUATION_DB = 80;
/** Pass band of the built-in anti-alias filter as a fraction of the new Nyquist frequency. */
export const ANTI_ALIAS_PASS_FRACTION = 0.8;

/**
 * Taps of the built-in anti-alias low-pass for a factor: Kaiser, 80 dB, flat to 80 % of the new
 * Nyquist frequency and in its stop band from the new Nyquist frequency on, so that what folds
 * back lands only in the top 20 % of the new band.
 */
export function antiAliasTaps(factor: number): Float64Array {
  // Designed at a nominal rate of 1 Hz: the taps only depend on the edges relative to the rate.
  const newNyquist = 0.5 / factor;
  const transition = (1 - ANTI_ALIAS_PASS_FRACTION) * newNyquist;
  return kaiserTaps({
    response: 'lowpass',
    cutoff: newNyquist - transition / 2,
    transition,
    attenuation: ANTI_ALIAS_ATTENUATION_DB,
    sampleRate: 1,
  }).taps;
}

export const decimateStage: StageDefinition<DecimateParams> = {
  kind: 'decimate',
  title: 'Decimate',
  summary: 'Reduces the sample rate by an integer factor, with an optional built-in anti-alias low-pass (polyphase: only kept outputs are computed).',
  schema: decimateSchema,
  fields: {
    factor: { label: 'Factor', help: 'Keep one sample in this many: the output rate is the input rate divided by it.' },
    antiAlias: {
      label: 'Anti-alias filter',
      help: 'Run a Kaiser low-pass (80 dB, pass band to 80 % of the new Nyquist frequency) before keeping samples. Turn off only when a preceding filter already band-limits the stream.',
    },
  },
  accepts: ['real', 'complex', 'real-pair'],
  propagate(params, input) {
    const issues: ChainIssue[] = [];
    const sampleRate = input.sampleRate / params.factor;
    const newNyquist = sampleRate / 2;
    const output: StreamFormat = { ...input, sampleRate };
    delete output.bandLimit;
    if (params.antiAlias) {
      output.bandLimit = Math.min(newNyquist, input.bandLimit ?? newNyquist);
    } else if (input.bandLimit === undefined) {
      issues.push({
        severity: 'warning',
        code: ISSUE_CODES.decimateWithoutAntiAlias,
        field: 'antiAlias',
        message: `no anti-alias filter: nothing before this stage band-limits the stream, so everything above the new Nyquist frequency ${newNyquist} Hz folds onto the band (add a low-pass filter before it or turn on antiAlias)`,
      });
    } else if (input.bandLimit > newNyquist) {
      issues.push({
        severity: 'warning',
        code: ISSUE_CODES.decimateAliasing,
        field: 'factor',
        message: `the stream is band-limited only to ${input.bandLimit} Hz, above the new Nyquist frequency ${newNyquist} Hz: the band between them aliases (lower the factor, narrow the filter before it or turn on antiAlias)`,
      });
    } else {
      output.bandLimit = input.bandLimit;
    }
    return { output, issues };
  },
  create(params, input) {
    const channels = input.sampleType === 'real' ? 1 : 2;
    const taps = params.antiAlias ? antiAliasTaps(params.factor) : [1];
    const decimator = new FirDecimator(taps, params.factor, channels);
    return {
      process: (block) => decimator.process(block),
      finish: () => new Float32Array(0),
    };
  },
};

// Full convolution a * b: the single FIR equivalent to running a then b.
function convolve(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const out = new Float64Array(a.length + b.length - 1);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j] += a[i] * b[j];
  return out;
}

/**
 * One processor for a FIR `filter` stage followed by a `decimate` stage: the filter's taps (with
 * the built-in anti-alias taps convolved in when antiAlias is on) run as one polyphase decimator,
 * so only the kept outputs are computed, a factor `factor` less work than filtering at the full
 * rate. With antiAlias off the output equals that of the two stages one after the other up to
 * float64 rounding (the sums run in another order). Undefined when the filter is not FIR (an IIR
 * needs every output for its state).
 */
export function createFilterDecimateProcessor(filterParams: FilterParams, decimateParams: DecimateParams, input: StreamFormat): StageProcessor | undefined {
  const design = designFilter(filterParams, input.sampleRate);
  if (design.kind !== 'fir') return undefined;
  const taps = decimateParams.antiAlias ? convolve(design.taps, antiAliasTaps(decimateParams.factor)) : design.taps;
  const decimator = new FirDecimator(taps, decimateParams.factor, input.sampleType === 'real' ? 1 : 2);
  return {
    process: (block) => decimator.process(block),
    finish: () => new Float32Array(0),
  };
}
