/**
 * Checks across fields of a synthesizer spec (Nyquist, datatype against layout, impairments a real
 * capture cannot have), the final `synthSpecSchema`, and `parseSynthSpec`, which turns the first
 * problem into an error naming the field.
 */
import { z } from 'zod';
import type { ChainIssue } from '../types';
import { FormatError, parseDatatype } from '../formats/datatype';
import { checkLayoutFits } from '../formats/layout';
import { MAX_SYNTH_SAMPLES, synthSampleCount, synthSpecObject } from './spec';

type SpecObject = z.output<typeof synthSpecObject>;

function formatHz(hz: number): string {
  return `${Number(hz.toPrecision(12))} Hz`;
}

/** The frequency range a component may occupy: [-fs/2, fs/2] for complex, [0, fs/2] for real. */
function allowedRange(spec: SpecObject): { low: number; high: number; text: string } {
  const half = spec.sampleRate / 2;
  return spec.layout === 'real'
    ? { low: 0, high: half, text: `0 to fs/2 = ${formatHz(half)} for a real layout` }
    : { low: -half, high: half, text: `-fs/2 to fs/2 = +-${formatHz(half)} for a ${spec.layout} layout` };
}

function checkSpec(spec: SpecObject, ctx: z.RefinementCtx): void {
  const add = (path: (string | number)[], message: string) => ctx.addIssue({ code: z.ZodIssueCode.custom, path, message });

  const samples = synthSampleCount(spec);
  if (samples < 1) add(['duration'], `gives ${samples} samples at ${formatHz(spec.sampleRate)}; needs at least 1`);
  if (samples > MAX_SYNTH_SAMPLES) add(['duration'], `gives ${samples} samples; at most ${MAX_SYNTH_SAMPLES} are allowed`);

  try {
    const datatype = parseDatatype(spec.datatype, 'datatype');
    try {
      checkLayoutFits(spec.layout, datatype, 'layout');
    } catch (e) {
      add(['layout'], stripField(e, 'layout'));
    }
  } catch (e) {
    add(['datatype'], stripField(e, 'datatype'));
  }

  const range = allowedRange(spec);
  const offset = spec.impairments.frequencyOffset;
  const offsetNote = offset !== 0 ? ` (with the frequency offset of ${formatHz(offset)})` : '';
  const checkFrequency = (path: (string | number)[], f: number) => {
    const shifted = f + offset;
    if (shifted < range.low || shifted > range.high) add(path, `${formatHz(shifted)}${offsetNote} lies outside ${range.text}`);
  };
  spec.tones.forEach((tone, k) => checkFrequency(['tones', k, 'frequency'], tone.frequency));
  spec.carriers.forEach((carrier, k) => {
    checkFrequency(['carriers', k, 'frequency'], carrier.frequency);
    if (carrier.modulation === 'am' || carrier.modulation === 'fm') {
      if (carrier.toneFrequency >= spec.sampleRate / 2) {
        add(['carriers', k, 'toneFrequency'], `${formatHz(carrier.toneFrequency)} must be below fs/2 = ${formatHz(spec.sampleRate / 2)}`);
      }
    } else {
      const bandwidth = carrier.symbolRate * (1 + carrier.rollOff);
      const usable = spec.layout === 'real' ? spec.sampleRate / 2 : spec.sampleRate;
      if (bandwidth > usable) {
        add(
          ['carriers', k, 'symbolRate'],
          `occupied bandwidth symbolRate x (1 + rollOff) = ${formatHz(bandwidth)} exceeds the ${formatHz(usable)} a ${spec.layout} capture at ${formatHz(spec.sampleRate)} holds`,
        );
      }
    }
  });

  if (spec.layout === 'real') {
    const imp = spec.impairments;
    if (imp.gainImbalance !== 0) add(['impairments', 'gainImbalance'], 'must be 0 for a real layout (there is no Q channel)');
    if (imp.phaseImbalance !== 0) add(['impairments', 'phaseImbalance'], 'must be 0 for a real layout (there is no Q channel)');
    if (imp.dcOffsetQ !== 0) add(['impairments', 'dcOffsetQ'], 'must be 0 for a real layout (there is no Q channel; use dcOffsetI)');
  }

  if (spec.noise.mode === 'snr' && spec.tones.length === 0 && spec.carriers.length === 0) {
    add(['noise', 'snr'], 'needs at least one tone or carrier to measure the SNR against');
  }
}

function stripField(e: unknown, field: string): string {
  const message = e instanceof FormatError || e instanceof Error ? e.message : String(e);
  return message.startsWith(`${field}: `) ? message.slice(field.length + 2) : message;
}

/** The synthesizer spec: field schema plus the checks across fields. */
export const synthSpecSchema = synthSpecObject.superRefine(checkSpec);

/** A spec as the form or API gives it (defaults not yet filled in). */
export type SynthSpecInput = z.input<typeof synthSpecSchema>;
/** A validated spec with every default filled in. */
export type SynthSpec = z.output<typeof synthSpecSchema>;

/** Error for an invalid synthesizer spec; `field` is the dot path of the first problem (e.g. `tones[0].frequency`). */
export class SynthSpecError extends Error {
  readonly field: string;
  readonly issues: { field: string; message: string }[];
  constructor(issues: { field: string; message: string }[]) {
    const first = issues[0];
    super(first ? `${first.field}: ${first.message}` : 'invalid synthesizer spec');
    this.name = 'SynthSpecError';
    this.field = first?.field ?? '';
    this.issues = issues;
  }
}

/** Dot path of a zod issue path: `carriers[1].symbolRate`. */
export function fieldPath(path: (string | number)[]): string {
  let out = '';
  for (const part of path) out += typeof part === 'number' ? `[${part}]` : out ? `.${part}` : part;
  return out || '(spec)';
}

/** Validate a spec and fill its defaults; throws SynthSpecError naming the field of the first problem. */
export function parseSynthSpec(input: unknown): SynthSpec {
  const result = synthSpecSchema.safeParse(input);
  if (result.success) return result.data;
  throw new SynthSpecError(result.error.issues.map((issue) => ({ field: fieldPath(issue.path), message: issue.message })));
}

/**
 * Warnings for a valid spec: things that are allowed but probably not meant, such as a carrier's
 * band folding over the Nyquist frequency or levels that will clip.
 */
export function synthSpecWarnings(spec: SynthSpec): ChainIssue[] {
  const issues: ChainIssue[] = [];
  const range = allowedRange(spec);
  const offset = spec.impairments.frequencyOffset;
  spec.carriers.forEach((carrier, k) => {
    let halfBand: number;
    if (carrier.modulation === 'am') halfBand = carrier.toneFrequency;
    // Carson's rule: about 98 % of an FM signal's power lies within deviation + tone of the carrier.
    else if (carrier.modulation === 'fm') halfBand = carrier.deviation + carrier.toneFrequency;
    else halfBand = (carrier.symbolRate * (1 + carrier.rollOff)) / 2;
    const f = carrier.frequency + offset;
    if (f - halfBand < range.low || f + halfBand > range.high) {
      issues.push({
        severity: 'warning',
        code: 'carrier-band-folds',
        field: `carriers[${k}].frequency`,
        message: `carriers[${k}]: its band ${formatHz(f - halfBand)} to ${formatHz(f + halfBand)} reaches beyond ${range.text} and folds back`,
      });
    }
  });
  // Sum of peak amplitudes is the worst case; digital carriers peak a few dB above their mean power.
  let peak = Math.abs(spec.impairments.dcOffsetI) + Math.abs(spec.impairments.dcOffsetQ);
  for (const tone of spec.tones) peak += 10 ** (tone.level / 20);
  for (const carrier of spec.carriers) {
    const rms = 10 ** (carrier.level / 20);
    peak += carrier.modulation === 'am' ? rms * (1 + carrier.depth) : carrier.modulation === 'fm' ? rms : rms * 2;
  }
  if (peak > 1 && spec.impairments.clip) {
    issues.push({
      severity: 'warning',
      code: 'may-clip',
      field: 'tones',
      message: `the components may add up to ${(20 * Math.log10(peak)).toFixed(1)} dBFS peak and clip at full scale`,
    });
  }
  return issues;
}
