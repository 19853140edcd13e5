/**
 * quadrature-mix: real input to complex baseband with a digital LO. I = x cos(w t + phase),
 * Q = x sin(w t + phase); convention 'i-minus-jq' forms I - jQ = x e^{-j(w t + phase)}, so a tone at
 * f_LO + f lands at +f (common practice: spectral orientation follows the sign of Q). 'i-plus-jq'
 * forms I + jQ and puts it at -f. No filtering: the sum-frequency term at 2 f_LO + f stays until a
 * following low-pass removes it.
 */
import { z } from 'zod';
import type { ChainIssue, StageDefinition, StreamFormat } from '../types';
import { BlockBuffer } from './block-buffer';
import { radiansFromDegrees } from './levels';
import { Nco } from './nco';

/** Parameters of quadrature-mix: loFrequency [Hz], phase [deg], sign convention. */
export const quadratureMixSchema = z
  .object({
    loFrequency: z.number().finite().min(0).max(1e12).default(0),
    phase: z.number().finite().min(-360).max(360).default(0),
    convention: z.enum(['i-minus-jq', 'i-plus-jq']).default('i-minus-jq'),
  })
  .strict();

export type QuadratureMixParams = z.infer<typeof quadratureMixSchema>;

export const quadratureMixStage: StageDefinition<QuadratureMixParams> = {
  kind: 'quadrature-mix',
  title: 'Quadrature mix (real to complex)',
  summary:
    'Multiplies a real stream by cos and sin of a digital LO. I - jQ (default) puts a tone at LO + f at +f; I + jQ puts it at -f. Follow with a low-pass filter.',
  schema: quadratureMixSchema,
  fields: {
    loFrequency: { label: 'LO frequency', unit: 'Hz', help: 'Frequency of the digital LO; the band around it moves to 0 Hz.' },
    phase: { label: 'LO phase', unit: 'deg', help: 'Phase of cos and sin at the first sample.' },
    convention: {
      label: 'Sign convention',
      help: "'i-minus-jq': output I - jQ = x e^{-j w t}, a tone at LO + f appears at +f (upright spectrum). 'i-plus-jq': output I + jQ, the tone appears at -f (inverted spectrum).",
    },
  },
  accepts: ['real'],
  propagate(params, input) {
    const issues: ChainIssue[] = [];
    const nyquist = input.sampleRate / 2;
    if (params.loFrequency > nyquist) {
      issues.push({
        severity: 'warning',
        code: 'frequency-above-nyquist',
        field: 'loFrequency',
        message: `LO at ${params.loFrequency} Hz is above the Nyquist frequency ${nyquist} Hz of the input: it acts as its alias`,
      });
    }
    const output: StreamFormat = { sampleRate: input.sampleRate, sampleType: 'complex' };
    // Either convention moves RF c + LO to 0 Hz; I + jQ mirrors the band around it (LO + f lands at -f).
    if (input.centerFrequency !== undefined) output.centerFrequency = input.centerFrequency + params.loFrequency;
    if ((params.convention === 'i-plus-jq') !== (input.spectrumInverted === true)) output.spectrumInverted = true;
    return { output, issues };
  },
  create(params, input) {
    // I - jQ = x e^{-j(wt + phase)} is the same oscillator run at -f with phase -phase.
    const sign = params.convention === 'i-minus-jq' ? -1 : 1;
    const nco = new Nco(sign * params.loFrequency, input.sampleRate, sign * radiansFromDegrees(params.phase));
    const out = new BlockBuffer();
    return {
      process(block) {
        const y = out.take(block.length * 2);
        nco.mixReal(block, y);
        return y;
      },
      finish() {
        return out.take(0);
      },
    };
  },
};
