/**
 * Wording of validation messages: a stage is named by position, id and kind
 * (`stages[2] (id "lp", filter)`), then the field, then the problem (`cutoff: must be > 0 Hz`).
 */
import { z, type ZodIssue } from 'zod';

/** How a stage is named in messages: `stages[2] (id "lp", filter)`. */
export function stageLabel(index: number, id: unknown, kind: unknown): string {
  const idText = typeof id === 'string' ? `id ${JSON.stringify(id)}` : 'no id';
  const kindText = typeof kind === 'string' ? kind : 'no kind';
  return `stages[${index}] (${idText}, ${kindText})`;
}

/** Dot/bracket path of a zod issue: `coefficients[3]`, `band.low`. */
export function fieldPath(path: (string | number)[]): string {
  let text = '';
  for (const part of path) {
    if (typeof part === 'number') text += `[${part}]`;
    else text += text === '' ? part : `.${part}`;
  }
  return text;
}

/** A frequency for people: `1.25 MHz`, `400 kHz`, `-600 Hz`. */
export function formatFrequency(hz: number): string {
  const magnitude = Math.abs(hz);
  const [scale, unit] = magnitude >= 1e9 ? [1e9, 'GHz'] : magnitude >= 1e6 ? [1e6, 'MHz'] : magnitude >= 1e3 ? [1e3, 'kHz'] : [1, 'Hz'];
  return `${Number((hz / scale).toPrecision(6))} ${unit}`;
}

function withUnit(value: number | bigint, unit: string | undefined): string {
  return unit ? `${value} ${unit}` : String(value);
}

function article(word: string): string {
  return /^[aeiou]/.test(word) ? `an ${word}` : `a ${word}`;
}

/**
 * The problem part of a message for one zod issue. A message written into the schema wins; zod's
 * generic wording is replaced by a shorter one that carries the field's unit.
 */
export function describeZodIssue(issue: ZodIssue, unit?: string): string {
  const generic = z.defaultErrorMap(issue, { defaultError: issue.message, data: undefined }).message;
  if (issue.message !== generic) return issue.message;
  switch (issue.code) {
    case 'invalid_type':
      if (issue.received === 'undefined') return 'is required';
      if (issue.expected === 'integer') return `must be an integer, got ${issue.received === 'float' ? 'a fraction' : issue.received}`;
      return `must be ${article(issue.expected)}, got ${issue.received}`;
    case 'too_small':
      if (issue.type === 'number' || issue.type === 'bigint') return `must be ${issue.inclusive ? '>=' : '>'} ${withUnit(issue.minimum, unit)}`;
      if (issue.type === 'array') return `needs at least ${issue.minimum} entr${issue.minimum === 1 ? 'y' : 'ies'}`;
      if (issue.type === 'string') return Number(issue.minimum) <= 1 ? 'must not be empty' : `needs at least ${issue.minimum} characters`;
      return issue.message;
    case 'too_big':
      if (issue.type === 'number' || issue.type === 'bigint') return `must be ${issue.inclusive ? '<=' : '<'} ${withUnit(issue.maximum, unit)}`;
      if (issue.type === 'array') return `allows at most ${issue.maximum} entries`;
      if (issue.type === 'string') return `allows at most ${issue.maximum} characters`;
      return issue.message;
    case 'invalid_enum_value':
      return `must be one of ${issue.options.map((o) => `'${String(o)}'`).join(', ')}, got ${JSON.stringify(issue.received)}`;
    case 'invalid_union_discriminator':
      return `must be one of ${issue.options.map((o) => `'${String(o)}'`).join(', ')}`;
    case 'invalid_literal':
      return `must be ${JSON.stringify(issue.expected)}`;
    case 'not_multiple_of':
      return `must be a multiple of ${issue.multipleOf}`;
    case 'not_finite':
      return 'must be a finite number';
    default:
      return issue.message;
  }
}
