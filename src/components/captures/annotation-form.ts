/**
 * The annotation editor's values and their reading into a SigMF annotation: start and duration
 * are typed as times with units ("12.5 ms") or as sample numbers ("50000") and stored in samples;
 * frequency edges are absolute RF frequencies in Hz typed with SI prefixes ("2.4121 GHz"). The
 * server repeats the range checks; these only put the message beside the field before sending.
 */
import { z } from 'zod';
import { formatQuantity, parseQuantity } from '@/lib/units';
import type { Annotation } from './types';
import type { Capture } from '@/contracts/capture';

/** What the user typed, one string per field. */
export interface AnnotationFormValues {
  label: string;
  start: string;
  duration: string;
  lowerEdge: string;
  upperEdge: string;
  comment: string;
}

export type AnnotationField = keyof AnnotationFormValues;

/** What the form's checks need to know about the capture (rate in Hz, samples in the whole capture). */
export type AnnotationContext = Pick<Capture, 'sampleRate' | 'sampleCount'>;

/** Outcome of reading a position or a length: a whole number of samples, or what is wrong. */
export type SamplesReading = { ok: true; samples: number; fromTime: boolean } | { ok: false; message: string };

const SAMPLE_ALIASES = ['sample', 'sa'];

/**
 * Reads a time ("12.5 ms", "250u s") or a sample number ("50000", "50,000 samples") into samples
 * at `sampleRate` (Hz). A number without a unit is a sample number, so it must be whole.
 */
export function parseSamples(text: string, sampleRate: number): SamplesReading {
  const trimmed = String(text ?? '').trim();
  if (trimmed === '') return { ok: false, message: 'is empty: enter a time such as 12.5 ms or a sample number such as 50000' };
  const count = parseQuantity(trimmed, 'samples', { aliases: SAMPLE_ALIASES });
  if (count.ok) {
    if (!Number.isInteger(count.value)) return { ok: false, message: `"${trimmed}" is not a whole sample number: add a time unit for a time, e.g. ${trimmed} ms` };
    if (count.value < 0) return { ok: false, message: 'must not be negative' };
    return { ok: true, samples: count.value, fromTime: false };
  }
  const time = parseQuantity(trimmed, 's', { aliases: ['sec'] });
  if (!time.ok) return { ok: false, message: `"${trimmed}" is neither a time (e.g. 12.5 ms) nor a sample number (e.g. 50000)` };
  if (time.value < 0) return { ok: false, message: 'must not be negative' };
  // Times rarely fall on a sample: the nearest one is what SigMF can store.
  return { ok: true, samples: Math.round(time.value * sampleRate), fromTime: true };
}

/**
 * The shortest time text (s with an SI prefix) that reads back as exactly `samples` at
 * `sampleRate` (Hz); the sample number itself when no time of up to 15 digits does.
 */
export function formatSampleTime(samples: number, sampleRate: number): string {
  if (samples === 0) return '0 s';
  const seconds = samples / sampleRate;
  for (let significant = 4; significant <= 15; significant++) {
    // formatQuantity writes a minute or more as "1 min 30 s", which no field reads back.
    const text = seconds < 60 ? formatQuantity(seconds, 's', { significant }) : `${Number(seconds.toPrecision(significant))} s`;
    const back = parseSamples(text, sampleRate);
    if (back.ok && back.samples === samples) return text;
  }
  return String(samples);
}

/** Frequency text for a field (Hz with an SI prefix), precise enough to read back to 1 Hz below 10 GHz. */
export function formatEdge(hz: number): string {
  return formatQuantity(hz, 'Hz', { significant: 10 });
}

/** Empty values for a new annotation. */
export function emptyAnnotationValues(): AnnotationFormValues {
  return { label: '', start: '', duration: '', lowerEdge: '', upperEdge: '', comment: '' };
}

/** Values of the form for editing an existing annotation. */
export function annotationValues(annotation: Annotation, sampleRate: number): AnnotationFormValues {
  return {
    label: annotation.label,
    start: formatSampleTime(annotation.sampleStart, sampleRate),
    duration: annotation.sampleCount === null ? '' : formatSampleTime(annotation.sampleCount, sampleRate),
    lowerEdge: annotation.freqLowerEdge === null ? '' : formatEdge(annotation.freqLowerEdge),
    upperEdge: annotation.freqUpperEdge === null ? '' : formatEdge(annotation.freqUpperEdge),
    comment: annotation.comment,
  };
}

/** The SigMF core keys the form writes; any other key of an edited annotation is kept as it was. */
export const EDITED_KEYS = ['core:sample_start', 'core:sample_count', 'core:freq_lower_edge', 'core:freq_upper_edge', 'core:label', 'core:comment'] as const;

/** A SigMF annotation object as the API takes it. */
export type SigmfAnnotationObject = Record<string, unknown> & { 'core:sample_start': number };

function rangeMessage(samples: number, sampleRate: number): string {
  return `${formatSampleTime(samples, sampleRate)}, ${samples.toLocaleString('en')} samples`;
}

/**
 * The form's zod schema for a capture: reads the typed text into a SigMF annotation object
 * (samples, Hz), with each problem on its own field.
 */
export function annotationFormSchema({ sampleRate, sampleCount }: AnnotationContext) {
  return z
    .object({
      label: z.string().max(200, 'at most 200 characters'),
      start: z.string(),
      duration: z.string(),
      lowerEdge: z.string(),
      upperEdge: z.string(),
      comment: z.string().max(4000, 'at most 4000 characters'),
    })
    .transform((values, ctx): SigmfAnnotationObject => {
      let failed = false;
      const fail = (path: AnnotationField, message: string) => {
        failed = true;
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: [path], message });
      };
      const end = rangeMessage(sampleCount, sampleRate);
      const start = parseSamples(values.start, sampleRate);
      if (!start.ok) fail('start', `Start ${start.message}.`);
      else if (start.samples >= sampleCount) fail('start', `Start is past the end of the capture (${end}).`);

      let count: number | undefined;
      if (values.duration.trim() !== '') {
        const duration = parseSamples(values.duration, sampleRate);
        if (!duration.ok) fail('duration', `Duration ${duration.message}.`);
        else if (duration.samples < 1) fail('duration', `Duration is shorter than one sample (${formatQuantity(1 / sampleRate, 's')}).`);
        else if (start.ok && start.samples + duration.samples > sampleCount) {
          fail('duration', `Duration reaches past the end of the capture: at most ${rangeMessage(sampleCount - start.samples, sampleRate)} from this start.`);
        } else count = duration.samples;
      }

      const lowerText = values.lowerEdge.trim();
      const upperText = values.upperEdge.trim();
      let lower: number | undefined;
      let upper: number | undefined;
      if (lowerText !== '' || upperText !== '') {
        const lowerRead = lowerText === '' ? null : parseQuantity(lowerText, 'Hz');
        const upperRead = upperText === '' ? null : parseQuantity(upperText, 'Hz');
        if (lowerRead === null) fail('lowerEdge', 'Give both frequency edges, or neither.');
        else if (!lowerRead.ok) fail('lowerEdge', `Lower edge ${lowerRead.message}.`);
        if (upperRead === null) fail('upperEdge', 'Give both frequency edges, or neither.');
        else if (!upperRead.ok) fail('upperEdge', `Upper edge ${upperRead.message}.`);
        if (lowerRead?.ok && upperRead?.ok) {
          if (upperRead.value < lowerRead.value) {
            fail('upperEdge', `Upper edge ${formatEdge(upperRead.value)} is below the lower edge ${formatEdge(lowerRead.value)}.`);
          } else {
            lower = lowerRead.value;
            upper = upperRead.value;
          }
        }
      }
      if (!start.ok || failed) return z.NEVER;

      const out: SigmfAnnotationObject = { 'core:sample_start': start.samples };
      if (count !== undefined) out['core:sample_count'] = count;
      if (lower !== undefined && upper !== undefined) {
        out['core:freq_lower_edge'] = lower;
        out['core:freq_upper_edge'] = upper;
      }
      if (values.label.trim()) out['core:label'] = values.label.trim();
      if (values.comment.trim()) out['core:comment'] = values.comment.trim();
      return out;
    });
}

/** The edited annotation over the original: the form's keys replaced, extension keys kept. */
export function mergeAnnotation(original: Record<string, unknown> | undefined, edited: SigmfAnnotationObject): SigmfAnnotationObject {
  const kept: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(original ?? {})) if (!(EDITED_KEYS as readonly string[]).includes(key)) kept[key] = value;
  return { ...kept, ...edited };
}

/**
 * The whole list to send: `edited` at `index` (appended when index is null), in sample_start
 * order as SigMF asks; answers the edited annotation's position in the sent list.
 */
export function listWith(list: Record<string, unknown>[], index: number | null, edited: SigmfAnnotationObject): { list: Record<string, unknown>[]; position: number } {
  const next = index === null ? [...list, edited] : list.map((a, i) => (i === index ? edited : a));
  const startOf = (a: Record<string, unknown>) => (typeof a['core:sample_start'] === 'number' ? (a['core:sample_start'] as number) : 0);
  // Array sort is stable, so annotations with the same start keep their order.
  const sorted = [...next].sort((a, b) => startOf(a) - startOf(b));
  return { list: sorted, position: sorted.indexOf(edited) };
}

const SERVER_KEYS: Record<string, AnnotationField> = {
  'core:sample_start': 'start',
  'core:sample_count': 'duration',
  'core:freq_lower_edge': 'lowerEdge',
  'core:freq_upper_edge': 'upperEdge',
  'core:label': 'label',
  'core:comment': 'comment',
};

/**
 * Where a server error belongs: on a form field when it names the annotation being saved
 * (`annotations[i].core:...` with i = `position`, the field path dropped from the message),
 * else on the whole form (field null).
 */
export function placeServerError(error: { field?: string | null; message: string }, position: number): { field: AnnotationField | null; message: string } {
  const match = /^annotations\[(\d+)\]\.(.+)$/.exec(error.field ?? '');
  const field = match && Number(match[1]) === position ? (SERVER_KEYS[match[2]] ?? null) : null;
  if (field === null) return { field, message: error.message };
  const message = error.message.startsWith(`${error.field}: `) ? error.message.slice(error.field!.length + 2) : error.message;
  return { field, message: message.charAt(0).toUpperCase() + message.slice(1) };
}
