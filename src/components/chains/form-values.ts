/**
 * Between a stage's parameters (numbers in base units, as the chain document holds them) and the
 * text a form shows and a person types ("1.25 MHz", "-3", "0.1, 0.2, 0.1"). Typed text is read
 * with SI prefixes; parameters are written with the prefix that reads best, but only when that
 * text reads back to exactly the same number.
 */
import { parseQuantity } from '@/lib/units';
import type { FieldSpec } from './field-model';

/** What a form holds per field: text for numbers and lists, a flag, or the chosen options. */
export type FormValue = string | boolean | string[];
export type FormValues = Record<string, FormValue>;

// Units typed with an SI prefix; the others (dB, deg, counts) are plain numbers.
const PREFIXED_UNITS = new Set(['Hz', 's', 'FS', 'V']);
const PREFIXES: [number, string][] = [
  [12, 'T'], [9, 'G'], [6, 'M'], [3, 'k'], [0, ''], [-3, 'm'], [-6, 'µ'], [-9, 'n'], [-12, 'p'],
];

/** Whether a field's text carries its (prefixed) unit, rather than the unit standing beside it. */
export function unitInText(unit: string): boolean {
  return PREFIXED_UNITS.has(unit);
}

/**
 * The text of a number in a field of `unit`: `1250000, 'Hz'` gives "1.25 MHz", `0.00025, 's'`
 * "250 ms", `-3, 'dB'` "-3". Always reads back to the same number through {@link parseFieldNumber}.
 */
export function formatFieldNumber(value: number, unit: string): string {
  if (!Number.isFinite(value)) return String(value);
  if (!unitInText(unit)) return String(value);
  if (value === 0) return `0 ${unit}`;
  const power = Math.floor(Math.log10(Math.abs(value)) + 1e-9);
  for (const [exponent, prefix] of PREFIXES) {
    if (power < exponent) continue;
    const mantissa = Number((value / 10 ** exponent).toPrecision(15));
    const text = `${mantissa} ${prefix}${unit}`;
    const back = parseFieldNumber(text, unit);
    if (back.ok && back.value === value) return text;
    break;
  }
  return `${value} ${unit}`;
}

/** Read the text of a number field of `unit`; counts (samples) accept k and M as well. */
export function parseFieldNumber(text: string, unit: string): { ok: true; value: number } | { ok: false; message: string } {
  // A count typed as "64k" is 64000: counts take prefixes, their unit word is optional.
  if (unit === 'samples' || unit === 'taps') return parseQuantity(text, '', { aliases: [unit] });
  return parseQuantity(text, unit);
}

/** Read a pasted list of numbers: separated by commas, spaces, semicolons or new lines; brackets ignored. */
export function parseNumberList(text: string): { ok: true; values: number[] } | { ok: false; message: string } {
  const tokens = text.replace(/[[\]()]/g, ' ').split(/[\s,;]+/).filter(Boolean);
  if (tokens.length === 0) return { ok: false, message: 'is empty: paste at least one number' };
  const values: number[] = [];
  for (let i = 0; i < tokens.length; i++) {
    const value = Number(tokens[i]);
    if (!Number.isFinite(value)) return { ok: false, message: `entry ${i + 1} ("${tokens[i]}") is not a number` };
    values.push(value);
  }
  return { ok: true, values };
}

/** The form values of a stage's parameters for its fields. */
export function paramsToFormValues(fields: FieldSpec[], params: Record<string, unknown>): FormValues {
  const values: FormValues = {};
  for (const field of fields) {
    const value = params[field.name];
    switch (field.control) {
      case 'number':
        values[field.name] = typeof value === 'number' ? formatFieldNumber(value, field.unit) : value === undefined || value === null ? '' : String(value);
        break;
      case 'select':
        values[field.name] = typeof value === 'string' ? value : '';
        break;
      case 'checkbox':
        values[field.name] = value === true;
        break;
      case 'number-list':
        values[field.name] = Array.isArray(value) ? value.join(', ') : '';
        break;
      case 'choice-set':
        values[field.name] = Array.isArray(value) ? value.map(String) : [];
        break;
    }
  }
  return values;
}

/** Parameters read from form values, and the fields whose text could not be read (with why). */
export interface FormReading {
  params: Record<string, unknown>;
  errors: Record<string, string>;
}

/**
 * Parameters from form values: each field read into the document's units. A field whose text
 * cannot be read keeps its previous value (the document never holds half-typed text); an empty
 * optional number is left out. Parameters without a field in the form (hidden ones) are kept.
 */
export function formValuesToParams(fields: FieldSpec[], values: FormValues, previous: Record<string, unknown>): FormReading {
  const params: Record<string, unknown> = { ...previous };
  const errors: Record<string, string> = {};
  for (const field of fields) {
    const value = values[field.name];
    if (value === undefined) continue;
    switch (field.control) {
      case 'number': {
        const text = String(value).trim();
        if (text === '' && field.optional) {
          delete params[field.name];
          break;
        }
        const read = parseFieldNumber(text, field.unit);
        if (read.ok) params[field.name] = read.value;
        else errors[field.name] = read.message;
        break;
      }
      case 'select':
        params[field.name] = String(value);
        break;
      case 'checkbox':
        params[field.name] = value === true;
        break;
      case 'number-list': {
        const read = parseNumberList(String(value));
        if (read.ok) params[field.name] = read.values;
        else errors[field.name] = read.message;
        break;
      }
      case 'choice-set':
        // Keep the schema's order, not the order of clicks, so the document does not churn.
        params[field.name] = field.options.filter((o) => (value as string[]).includes(o));
        break;
    }
  }
  return { params, errors };
}
