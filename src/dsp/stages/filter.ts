/**
 * filter: FIR (windowed sinc, Kaiser, pasted taps) or IIR (Butterworth, Chebyshev I, Bessel as
 * biquads) applied to real, complex (taps real: I and Q alike) or two-channel streams at the same
 * rate. The output carries the design's stop-band edge as `bandLimit` so that a following
 * decimation can check for aliasing.
 */
import type { ChainIssue, StageDefinition, StreamFormat } from '../types';
import { ISSUE_CODES } from '../chain/issue-codes';
import { edgeAboveNyquist } from '../filters/band-edges';
import { BiquadCascade } from '../filters/biquad-cascade';
import { designFilter, filterStopBandEdge } from '../filters/design';
import { FirFilter } from '../filters/fir-decimator';
import { filterFields, filterSchema, type FilterParams } from '../filters/filter-params';
import { sosPoleRadius } from '../filters/stability';
import type { SosMatrix } from '../filters/zpk-to-sos';
import { EMPTY_BLOCK } from './block-buffer';

export type { FilterParams } from '../filters/filter-params';

const PARAM_NAMES = new Set(Object.keys(filterFields));

// A design error message starts with the field it is about ("taps: must be odd ...").
function designIssue(error: unknown): ChainIssue {
  const message = error instanceof Error ? error.message : String(error);
  const field = message.split(':', 1)[0];
  return { severity: 'error', code: ISSUE_CODES.invalidParameter, message, ...(PARAM_NAMES.has(field) ? { field } : {}) };
}

/** An error issue when a cascade has a pole on or outside the unit circle, else undefined. */
export function unstableFilterIssue(sos: SosMatrix): ChainIssue | undefined {
  const radius = sosPoleRadius(sos);
  if (radius < 1) return undefined;
  return {
    severity: 'error',
    code: ISSUE_CODES.unstableFilter,
    field: 'order',
    message: `the IIR design is unstable: a pole lies at radius ${radius.toPrecision(9)} (on or outside the unit circle); lower the order or widen the band`,
  };
}

const tighter = (a: number | undefined, b: number | undefined): number | undefined =>
  a === undefined ? b : b === undefined ? a : Math.min(a, b);

export const filterStage: StageDefinition<FilterParams> = {
  kind: 'filter',
  title: 'Filter',
  summary: 'FIR (windowed sinc, Kaiser, pasted taps) or IIR (Butterworth, Chebyshev I, Bessel) low/high/band-pass or band-stop at the same rate.',
  schema: filterSchema,
  fields: filterFields,
  accepts: ['real', 'complex', 'real-pair'],
  propagate(params, input) {
    const issues: ChainIssue[] = [];
    const output: StreamFormat = { ...input };
    const nyquist = input.sampleRate / 2;
    if (params.design !== 'taps') {
      const above = edgeAboveNyquist(params.response, params, input.sampleRate);
      if (above) {
        issues.push({
          severity: 'error',
          code: ISSUE_CODES.cutoffAboveNyquist,
          field: above.field,
          message: `${above.field}: ${above.value} Hz is at or above the Nyquist frequency ${nyquist} Hz of the input`,
        });
        return { output, issues };
      }
    }
    let design;
    try {
      design = designFilter(params, input.sampleRate);
    } catch (error) {
      issues.push(designIssue(error));
      return { output, issues };
    }
    const unstable = design.kind === 'iir' ? unstableFilterIssue(design.sos) : undefined;
    if (unstable) {
      issues.push(unstable);
      return { output, issues };
    }
    const bandLimit = tighter(input.bandLimit, filterStopBandEdge(params, design, input.sampleRate));
    if (bandLimit === undefined) delete output.bandLimit;
    else output.bandLimit = bandLimit;
    return { output, issues };
  },
  create(params, input) {
    const design = designFilter(params, input.sampleRate);
    const channels = input.sampleType === 'real' ? 1 : 2;
    const unstable = design.kind === 'iir' ? unstableFilterIssue(design.sos) : undefined;
    if (unstable) throw new RangeError(unstable.message);
    const filter = design.kind === 'fir' ? new FirFilter(design.taps, channels) : new BiquadCascade(design.sos, channels);
    return {
      process: (block) => filter.process(block),
      finish: () => EMPTY_BLOCK,
    };
  },
};
