/**
 * Parameters of the `filter` stage, one shape per design method (discriminated by `design`).
 * Frequencies are in Hz of the stage's input; checks that need the sample rate (edges below
 * Nyquist) happen at propagation and design time.
 */
import { z } from 'zod';
import type { FieldInfo } from '../types';
import { FILTER_RESPONSES } from './band-edges';
import { DESIGN_WINDOWS } from './design-windows';
import { MAX_IIR_ORDER } from './analog-prototypes';
import { MAX_FIR_TAPS } from './windowed-sinc';

const response = z.enum(FILTER_RESPONSES).default('lowpass');
const edge = z.number().finite().positive('must be > 0 Hz').optional();
const edges = { cutoff: edge, low: edge, high: edge };

const windowDesign = z
  .object({
    design: z.literal('window'),
    response,
    ...edges,
    taps: z.number().int().min(1).max(MAX_FIR_TAPS).default(127),
    window: z.enum(DESIGN_WINDOWS).default('hamming'),
    beta: z.number().finite().min(0).max(50).default(8.6),
  })
  .strict();

const kaiserDesign = z
  .object({
    design: z.literal('kaiser'),
    response,
    ...edges,
    ripple: z.number().finite().positive('must be > 0 dB').max(20).optional(),
    attenuation: z.number().finite().min(8).max(200).default(60),
    transition: z.number().finite().positive('must be > 0 Hz'),
  })
  .strict();

const tapsDesign = z
  .object({
    design: z.literal('taps'),
    coefficients: z.array(z.number().finite()).min(1).max(MAX_FIR_TAPS),
  })
  .strict();

const iirDesign = z
  .object({
    design: z.literal('iir'),
    family: z.enum(['butterworth', 'chebyshev1', 'bessel']).default('butterworth'),
    response,
    ...edges,
    order: z.number().int().min(1).max(MAX_IIR_ORDER).default(4),
    ripple: z.number().finite().positive('must be > 0 dB').max(20).default(1),
  })
  .strict();

/** Zod schema of the filter stage's parameters. */
export const filterSchema = z
  .discriminatedUnion('design', [windowDesign, kaiserDesign, tapsDesign, iirDesign], {
    errorMap: (issue, ctx) =>
      issue.code === 'invalid_union_discriminator'
        ? { message: "must be one of 'window', 'kaiser', 'taps', 'iir'" }
        : { message: ctx.defaultError },
  })
  .superRefine((params, ctx) => {
    if (params.design === 'taps') return;
    const needed: ('cutoff' | 'low' | 'high')[] =
      params.response === 'lowpass' || params.response === 'highpass' ? ['cutoff'] : ['low', 'high'];
    for (const field of needed) {
      if (params[field] === undefined) {
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: [field], message: `is required for a ${params.response} filter (Hz)` });
      }
    }
    if (params.low !== undefined && params.high !== undefined && !(params.low < params.high) && needed.length === 2) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['low'], message: `must lie below high (${params.high} Hz)` });
    }
    if (params.design === 'window' && (params.response === 'highpass' || params.response === 'bandstop') && params.taps % 2 === 0) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['taps'], message: `must be odd for a ${params.response} filter (an even-length linear-phase filter has a zero at Nyquist)` });
    }
  });

/** Parsed parameters of the filter stage. */
export type FilterParams = z.infer<typeof filterSchema>;

/** Labels, units and help for the editor's forms (all designs' fields). */
export const filterFields: Record<string, FieldInfo> = {
  design: { label: 'Design', help: "'window': windowed sinc; 'kaiser': length from attenuation and transition width; 'taps': pasted coefficients; 'iir': Butterworth, Chebyshev I or Bessel as biquads." },
  response: { label: 'Response', help: 'lowpass, highpass, bandpass or bandstop.' },
  cutoff: { label: 'Cut-off', unit: 'Hz', help: 'Low/high-pass edge: the -6 dB point for FIR designs, -3.01 dB for Butterworth, end of the ripple band for Chebyshev I, phase midpoint for Bessel.' },
  low: { label: 'Lower edge', unit: 'Hz', help: 'Band-pass/band-stop: lower edge (same convention as cut-off).' },
  high: { label: 'Upper edge', unit: 'Hz', help: 'Band-pass/band-stop: upper edge.' },
  taps: { label: 'Taps', unit: 'samples', help: 'Filter length; odd for high-pass and band-stop. Delay is (taps - 1) / 2 samples.' },
  window: { label: 'Window', help: 'Shapes the sinc: hamming (about 53 dB stop band), hann (44), blackman (74), blackman-harris (92), rectangular (21), kaiser (set by beta).' },
  beta: { label: 'Kaiser beta', help: 'Window shape when window is kaiser: larger beta, more attenuation and a wider transition.' },
  ripple: { label: 'Pass-band ripple', unit: 'dB', help: 'Kaiser: pass-band ripple allowed (peak to peak). Chebyshev I: ripple of the pass band.' },
  attenuation: { label: 'Stop-band attenuation', unit: 'dB', help: 'Kaiser: attenuation the stop band must reach.' },
  transition: { label: 'Transition width', unit: 'Hz', help: 'Kaiser: width of each transition band, centred on its edge.' },
  coefficients: { label: 'Coefficients', help: 'Pasted FIR taps, h[0] first (applied to I and Q alike for complex input).' },
  family: { label: 'Family', help: 'butterworth (maximally flat), chebyshev1 (steeper, ripple in the pass band), bessel (near-constant group delay).' },
  order: { label: 'Order', help: 'Order of the analogue prototype; band-pass and band-stop designs have twice as many poles.' },
};
