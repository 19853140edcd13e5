/**
 * Pure readers and writers of a list's state in the address bar's query string. Every reader
 * falls back to the default on a value it does not know, so a hand-edited or stale link shows the
 * default list instead of an error; writers leave defaults out, so a link stays short.
 */

/** Turns a list's state into a query string and back; `parse` never throws. */
export interface UrlCodec<S> {
  /** State from a query string (with or without the leading `?`); unknown values take defaults. */
  parse(search: string): S;
  /** Query string without the leading `?`; empty for the default state. */
  serialize(state: S): string;
}

// Beyond this a page number is a typo, not a place in any list this product holds.
const LAST_PAGE = 100_000;

/** The parameters of a query string, with or without its leading `?`. */
export function searchParams(search: string): URLSearchParams {
  return new URLSearchParams(search.startsWith('?') ? search.slice(1) : search);
}

/** `text` when it is one of `allowed`, else undefined. */
export function oneOf<T extends string>(text: string | null, allowed: readonly T[]): T | undefined {
  return text !== null && (allowed as readonly string[]).includes(text) ? (text as T) : undefined;
}

/** A 1-based page number; anything but a whole number from 1 up gives page 1. */
export function pageNumber(text: string | null): number {
  if (text === null || !/^\d{1,6}$/.test(text)) return 1;
  const page = Number(text);
  return page >= 1 && page <= LAST_PAGE ? page : 1;
}

/** A page size (rows) from the offered sizes, else `fallback`. */
export function pageSizeFrom(text: string | null, sizes: readonly number[], fallback: number): number {
  const size = text !== null && /^\d{1,4}$/.test(text) ? Number(text) : NaN;
  return sizes.includes(size) ? size : fallback;
}

/** A sort column and direction from `name` (ascending) or `-name` (descending); unknown names give `fallback`. */
export function sortFrom<K extends string>(
  text: string | null,
  names: Readonly<Record<string, K>>,
  fallback: { key: K; desc: boolean },
): { key: K; desc: boolean } {
  if (!text) return fallback;
  const desc = text.startsWith('-');
  const name = desc ? text.slice(1) : text;
  return Object.hasOwn(names, name) ? { key: names[name]!, desc } : fallback;
}

/** The URL word of a sort column and direction (`-name` when descending). */
export function sortText<K extends string>(key: K, desc: boolean, names: Readonly<Record<string, K>>): string {
  const name = Object.keys(names).find((word) => names[word] === key) ?? key;
  return desc ? `-${name}` : name;
}

/**
 * A query string from name/value pairs in the given order; undefined and empty values, and values
 * equal to their default, are left out. Commas stay readable (`status=queued,running`).
 */
export function buildSearch(pairs: [name: string, value: string | number | undefined, fallback?: string | number][]): string {
  const search = new URLSearchParams();
  for (const [name, value, fallback] of pairs) {
    if (value === undefined || value === '' || value === fallback) continue;
    search.set(name, String(value));
  }
  return search.toString().replace(/%2C/gi, ',');
}
