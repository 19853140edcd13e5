/**
 * Builders for environment settings: each takes the raw text of one variable (unset and blank
 * mean "use the default"), checks it, and yields a typed value. A failed check becomes a zod
 * issue whose message reads after the variable's name ("must be ..., got "x"").
 */
import { resolve } from 'node:path';
import { z } from 'zod';
import { parseByteSize } from '../units';

/** What the README and DEVELOPERS.md say of a setting besides its description. */
export interface SettingDoc {
  /** The default as a person writes it (`32GiB`, `local`), or '' when unset means "none". */
  default: string;
  /** Unit or kind of value: `bytes`, `ms`, `s`, `h`, `count`, `flag`, `path`, `text`, ... */
  unit: string;
}

type Check<T> = { ok: true; value: T } | { ok: false; problem: string };

/** A setting: raw text in, `T` out; `fallback` when unset or blank. */
function setting<T>(fallback: () => T, check: (text: string) => Check<T>) {
  return z
    .string()
    .optional()
    .transform((raw, ctx): T => {
      const text = (raw ?? '').trim();
      if (text === '') return fallback();
      const outcome = check(text);
      if (outcome.ok) return outcome.value;
      ctx.addIssue({ code: z.ZodIssueCode.custom, message: `${outcome.problem}, got "${raw}"` });
      return z.NEVER;
    });
}

/** A whole number within [min, max]. */
export function wholeNumber(fallback: number | (() => number), min: number, max = Number.MAX_SAFE_INTEGER) {
  return setting(typeof fallback === 'function' ? fallback : () => fallback, (text) => {
    const value = Number(text);
    if (Number.isSafeInteger(value) && value >= min && value <= max) return { ok: true, value };
    const range = max === Number.MAX_SAFE_INTEGER ? `>= ${min}` : `from ${min} to ${max}`;
    return { ok: false, problem: `must be a whole number ${range}` };
  });
}

/** A finite number above (or, with `orEqual`, at least) `min`. */
export function realNumber(fallback: number, min: number, orEqual: boolean, unit: string) {
  return setting(() => fallback, (text) => {
    const value = Number(text);
    if (Number.isFinite(value) && (orEqual ? value >= min : value > min)) return { ok: true, value };
    return { ok: false, problem: `must be a number of ${unit} ${orEqual ? '>=' : '>'} ${min}` };
  });
}

/** A byte size: a plain count or a binary suffix (`512MiB`, `8GiB`). */
export function byteSize(fallback: number) {
  return setting(() => fallback, (text) => {
    const value = parseByteSize(text);
    return value === null ? { ok: false, problem: 'must be a byte count such as 1073741824 or 8GiB' } : { ok: true, value };
  });
}

const TRUE = new Set(['1', 'true', 'yes', 'on']);
const FALSE = new Set(['0', 'false', 'no', 'off']);

/** A switch written `1`/`0`, `true`/`false`, `yes`/`no` or `on`/`off` (any case). */
export function flag(fallback: boolean) {
  return setting(() => fallback, (text) => {
    const lower = text.toLowerCase();
    if (TRUE.has(lower)) return { ok: true, value: true };
    if (FALSE.has(lower)) return { ok: true, value: false };
    return { ok: false, problem: 'must be true or false (1/0, yes/no, on/off)' };
  });
}

/** A debugging switch that never fails: any text but `0`, `false`, `no` or `off` turns it on. */
export function looseFlag() {
  return setting(() => false, (text) => ({ ok: true, value: !FALSE.has(text.toLowerCase()) }));
}

/** One of a fixed set of words. */
export function oneOf<const T extends string>(fallback: T, words: readonly T[]) {
  return setting(() => fallback, (text) =>
    (words as readonly string[]).includes(text)
      ? { ok: true, value: text as T }
      : { ok: false, problem: `must be ${words.map((w) => `"${w}"`).join(' or ')}` },
  );
}

/** Free text, trimmed; `fallback` (default undefined) when unset. */
export function text<T extends string | undefined = undefined>(fallback?: T) {
  return setting<string | T>(() => fallback as T, (value) => ({ ok: true, value }));
}

/** A folder or file path, made absolute against the working directory. */
export function path(fallback: string) {
  return setting(() => resolve(fallback), (value) => ({ ok: true, value: resolve(value) }));
}

/** An http(s) URL, or undefined when unset. */
export function httpUrl() {
  return setting<string | undefined>(() => undefined, (value) => {
    let url: URL | undefined;
    try {
      url = new URL(value);
    } catch {
      url = undefined;
    }
    if (url && (url.protocol === 'http:' || url.protocol === 'https:')) return { ok: true, value };
    return { ok: false, problem: 'must be an http(s) URL' };
  });
}

/** Comma-separated words, blanks dropped. */
export function list() {
  return setting<string[]>(() => [], (value) => ({ ok: true, value: value.split(',').map((s) => s.trim()).filter(Boolean) }));
}
