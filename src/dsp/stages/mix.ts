/**
 * mix: complex frequency shift by an NCO, output = x e^{+j (2 pi f t + phase)}. A frequency of
 * -1.25 MHz moves a tone at +1.25 MHz to 0 Hz.
 */
import { z } from 'zod';
import type { ChainIssue, StageDefinition, StreamFormat } from '../types';
import { BlockBuffer } from './block-buffer';
import { radiansFromDegrees } from './levels';
import { Nco } from './nco';

/** Parameters of mix: frequency [Hz] (shift, any sign), phase [deg] at the first sample. */
export const mixSchema = z
  .object({
    frequency: z.number().finite().min(-1e12).max(1e12).default(0),
    phase: z.number().finite().min(-360).max(360).default(0),
  })
  .strict();

export type MixParams = z.infer<typeof mixSchema>;

export const mixStage: StageDefinition<MixParams> = {
  kind: 'mix',
  title: 'Mix (frequency shift)',
  summary: 'Shifts a complex stream by +frequency with an NCO: -1.25 MHz moves a tone at +1.25 MHz to 0 Hz.',
  schema: mixSchema,
  fields: {
    frequency: {
      label: 'Shift frequency',
      unit: 'Hz',
      help: 'Every component moves by this amount (output = x e^{+j 2 pi f t}); to bring a signal at +f0 to 0 Hz enter -f0.',
    },
    phase: { label: 'Initial phase', unit: 'deg', help: 'Phase of the NCO at the first sample.' },
  },
  accepts: ['complex'],
  propagate(params, input) {
    const issues: ChainIssue[] = [];
    const nyquist = input.sampleRate / 2;
    if (Math.abs(params.frequency) > nyquist) {
      issues.push({
        severity: 'warning',
        code: 'frequency-above-nyquist',
        field: 'frequency',
        message: `shift of ${params.frequency} Hz is beyond the Nyquist frequency ${nyquist} Hz: it acts as its alias ${aliasOf(params.frequency, input.sampleRate)} Hz`,
      });
    }
    const output: StreamFormat = { sampleRate: input.sampleRate, sampleType: 'complex' };
    // A tone that stood for RF c + g now sits at g + f, so 0 Hz now stands for c - f; in a mirrored
    // stream it stood for c - g, so 0 Hz now stands for c + f.
    if (input.centerFrequency !== undefined) {
      output.centerFrequency = input.spectrumInverted ? input.centerFrequency + params.frequency : input.centerFrequency - params.frequency;
    }
    if (input.spectrumInverted) output.spectrumInverted = true;
    if (input.bandLimit !== undefined) {
      const shifted = input.bandLimit + Math.abs(params.frequency);
      if (shifted < nyquist) output.bandLimit = shifted;
    }
    return { output, issues };
  },
  create(params, input) {
    const nco = new Nco(params.frequency, input.sampleRate, radiansFromDegrees(params.phase));
    const out = new BlockBuffer();
    return {
      process(block) {
        const y = out.take(block.length);
        nco.mixComplex(block, y);
        return y;
      },
      finish() {
        return out.take(0);
      },
    };
  },
};

/** The frequency in [-fs/2, fs/2) that a shift of `frequency` Hz is equivalent to at `sampleRate` Hz. */
function aliasOf(frequency: number, sampleRate: number): number {
  const wrapped = frequency - sampleRate * Math.round(frequency / sampleRate);
  return wrapped === sampleRate / 2 ? -wrapped : wrapped;
}
