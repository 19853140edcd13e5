/**
 * quadrature-combine: two real channels (I and Q of a dual ADC) into one complex stream.
 * If the front end forms I = x cos(w_LO t) and Q = x sin(w_LO t), I - jQ puts a tone at
 * f_LO + f at +f and I + jQ puts it at -f (common practice); a front end whose Q is -x sin(w_LO t)
 * needs I + jQ for the same upright spectrum.
 */
import { z } from 'zod';
import type { StageDefinition, StreamFormat } from '../types';
import { BlockBuffer } from './block-buffer';

/** Parameters of quadrature-combine: sign convention and channel swap. */
export const quadratureCombineSchema = z
  .object({
    convention: z.enum(['i-plus-jq', 'i-minus-jq']).default('i-plus-jq'),
    swap: z.boolean().default(false),
  })
  .strict();

export type QuadratureCombineParams = z.infer<typeof quadratureCombineSchema>;

export const quadratureCombineStage: StageDefinition<QuadratureCombineParams> = {
  kind: 'quadrature-combine',
  title: 'Quadrature combine (two channels to complex)',
  summary:
    'Turns two real channels into complex samples, I + jQ (default) or I - jQ. With Q = x sin(w_LO t), I - jQ puts a tone at LO + f at +f; I + jQ puts it at -f.',
  schema: quadratureCombineSchema,
  fields: {
    convention: {
      label: 'Sign convention',
      help: "'i-plus-jq': output I + jQ. 'i-minus-jq': output I - jQ. When Q = x sin(w_LO t), I - jQ gives the upright spectrum (a tone at LO + f at +f) and I + jQ the inverted one; when Q = -x sin(w_LO t), I + jQ is upright. The output metadata marks the spectrum inverted (quadrille:spectrum_inverted) when it is mirrored against the capture read as I + jQ: with I - jQ, or with a swap, but not both.",
    },
    swap: { label: 'Swap channels', help: 'Use channel 1 as I and channel 0 as Q (I and Q cabled the other way round).' },
  },
  accepts: ['real-pair'],
  propagate(params, input) {
    // Each channel keeps its band limit; the complex stream then has the same highest |frequency|.
    const output: StreamFormat = { ...input, sampleType: 'complex' };
    // The capture's two channels are read as I + jQ (as the quick look reads them and as its
    // core:frequency is stated); I - jQ mirrors the band against that, and so does a swap
    // (Q + jI = j conj(I + jQ)); the two together cancel.
    const inverted = ((params.convention === 'i-minus-jq') !== params.swap) !== (input.spectrumInverted === true);
    if (inverted) output.spectrumInverted = true;
    else delete output.spectrumInverted;
    return { output, issues: [] };
  },
  create(params) {
    const iOffset = params.swap ? 1 : 0;
    const qOffset = params.swap ? 0 : 1;
    const qSign = params.convention === 'i-plus-jq' ? 1 : -1;
    const out = new BlockBuffer();
    return {
      process(block) {
        const y = out.take(block.length);
        for (let v = 0; v < block.length; v += 2) {
          y[v] = block[v + iOffset];
          y[v + 1] = qSign * block[v + qOffset];
        }
        return y;
      },
      finish() {
        return out.take(0);
      },
    };
  },
};
