/**
 * Display formatting of physical quantities: SI prefixes for linear units (Hz, sps, s, V),
 * binary prefixes for byte sizes, fixed decimals for logarithmic units (dB, dBFS, dBm), and
 * clock-style durations above a minute. Pure: safe in pages, islands and the engine's reports.
 * Also parses byte sizes as settings spell them (`512MiB`).
 */

/** Options for {@link formatQuantity}. */
export interface QuantityOptions {
  /** Significant digits kept for prefixed units (default 4); the integer part is never rounded. */
  significant?: number;
  /** Decimals kept for logarithmic units such as dB (default 2, trailing zeros dropped). */
  decimals?: number;
  /** Show a plus sign on positive values (offsets such as "+600 kHz"). */
  signed?: boolean;
}

/** A formatted quantity split into its parts, so a component can style number and unit apart. */
export interface QuantityParts {
  /** Sign and digits, e.g. "-1.25". */
  number: string;
  /** Prefix and unit, e.g. "MHz"; empty when the quantity has no unit. */
  unit: string;
  /** The whole text, number and unit separated by one space. */
  text: string;
}

// Decimal prefixes by power of 1000 (SI brochure, 9th edition, Table 7). The micro sign is U+00B5.
const SI_PREFIXES: Record<number, string> = {
  [-5]: 'f',
  [-4]: 'p',
  [-3]: 'n',
  [-2]: 'µ',
  [-1]: 'm',
  0: '',
  1: 'k',
  2: 'M',
  3: 'G',
  4: 'T',
  5: 'P',
};
const SI_MIN = -5;
const SI_MAX = 5;

// Binary prefixes by power of 1024 (IEC 80000-13).
const BINARY_PREFIXES = ['', 'Ki', 'Mi', 'Gi', 'Ti', 'Pi', 'Ei'];

// Units that take no prefix: levels and ratios are already logarithmic, angles and percentages
// read better as plain numbers.
const UNPREFIXED = new Set(['%', '°', 'deg', 'rad', 'ppm', 'ppb', 'bit', 'bits', 'dB', 'samples', 'taps']);

/** True when the unit is a logarithmic level (dB, dBFS, dBm, dBc, dBFS/Hz...). */
export function isLogUnit(unit: string): boolean {
  return /^dB/.test(unit);
}

/**
 * Format a value with its unit for display: `formatQuantity(1.25e6, 'Hz')` gives "1.25 MHz",
 * `formatQuantity(-3, 'dB')` gives "-3 dB", `formatQuantity(3 * 2 ** 20, 'B')` gives "3 MiB",
 * `formatQuantity(90, 's')` gives "1 min 30 s".
 */
export function formatQuantity(value: number, unit: string, options: QuantityOptions = {}): string {
  return quantityParts(value, unit, options).text;
}

/** Like {@link formatQuantity}, but returns the number and the prefixed unit separately. */
export function quantityParts(value: number, unit: string, options: QuantityOptions = {}): QuantityParts {
  if (Number.isNaN(value)) return join('—', '');
  if (!Number.isFinite(value)) return join(nonFinite(value), unit);
  if (unit === 'B' || unit === 'bytes') return bytesParts(value, options);
  if (unit === 's' && Math.abs(value) >= 60) return join(formatDuration(value), '');
  if (isLogUnit(unit) || UNPREFIXED.has(unit)) {
    const decimals = options.decimals ?? (unit === 'samples' || unit === 'taps' ? 0 : 2);
    return join(withSign(groupFixed(value, decimals), value, options.signed), unit);
  }
  return siParts(value, unit, options);
}

/** Format a byte count with binary prefixes: 1536 gives "1.5 KiB", 5 * 2**30 gives "5 GiB". */
export function formatBytes(bytes: number, options: QuantityOptions = {}): string {
  return bytesParts(bytes, options).text;
}

/**
 * Format a duration in seconds: below one minute with SI prefixes ("250 ms", "12.5 s"),
 * above as whole units of days, hours, minutes and seconds ("2 h 05 min", "1 min 30 s").
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return nonFinite(seconds) + ' s';
  if (Math.abs(seconds) < 60) return siParts(seconds, 's', {}).text;
  const sign = seconds < 0 ? '-' : '';
  let rest = Math.round(Math.abs(seconds));
  const days = Math.floor(rest / 86_400);
  rest -= days * 86_400;
  const hours = Math.floor(rest / 3_600);
  rest -= hours * 3_600;
  const minutes = Math.floor(rest / 60);
  const secs = rest - minutes * 60;
  // Two units are enough to read a duration at a glance; the second one is zero-padded so
  // columns of durations line up.
  if (days > 0) return `${sign}${days} d ${pad2(hours)} h`;
  if (hours > 0) return `${sign}${hours} h ${pad2(minutes)} min`;
  return `${sign}${minutes} min ${pad2(secs)} s`;
}

/** Round to `significant` digits without touching the integer part, drop trailing zeros. */
function roundSignificant(mantissa: number, significant: number): string {
  const abs = Math.abs(mantissa);
  const integerDigits = abs < 1 ? 1 : Math.floor(Math.log10(abs)) + 1;
  const decimals = Math.max(0, significant - integerDigits);
  return trimZeros(abs.toFixed(decimals));
}

function siParts(value: number, unit: string, options: QuantityOptions): QuantityParts {
  const significant = options.significant ?? 4;
  if (value === 0) return join(withSign('0', 0, options.signed), unit);
  let exponent = clamp(Math.floor(Math.log10(Math.abs(value)) / 3), SI_MIN, SI_MAX);
  let digits = roundSignificant(value / 1000 ** exponent, significant);
  // Rounding can carry into the next prefix: 999.96 kHz at four digits is 1 MHz, not 1000 kHz.
  if (Number(digits) >= 1000 && exponent < SI_MAX) {
    exponent += 1;
    digits = roundSignificant(value / 1000 ** exponent, significant);
  }
  return join(withSign(digits, value, options.signed), SI_PREFIXES[exponent] + unit);
}

function bytesParts(bytes: number, options: QuantityOptions): QuantityParts {
  if (!Number.isFinite(bytes)) return join(nonFinite(bytes), 'B');
  const abs = Math.abs(bytes);
  if (abs < 1024) return join(withSign(String(Math.round(abs)), bytes, options.signed), 'B');
  const significant = options.significant ?? 3;
  let power = Math.min(Math.floor(Math.log(abs) / Math.log(1024)), BINARY_PREFIXES.length - 1);
  let digits = roundSignificant(abs / 1024 ** power, significant);
  if (Number(digits) >= 1024 && power < BINARY_PREFIXES.length - 1) {
    power += 1;
    digits = roundSignificant(abs / 1024 ** power, significant);
  }
  return join(withSign(digits, bytes, options.signed), BINARY_PREFIXES[power] + 'B');
}

/** Fixed decimals with trailing zeros dropped and thousands grouped by commas. */
function groupFixed(value: number, decimals: number): string {
  const [integer, fraction] = trimZeros(Math.abs(value).toFixed(decimals)).split('.');
  const grouped = integer.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return fraction ? `${grouped}.${fraction}` : grouped;
}

function withSign(digits: string, value: number, signed: boolean | undefined): string {
  // A value that rounds to zero shows no sign: "-0 dB" would suggest a measurement below zero.
  if (Number(digits.replace(/,/g, '')) === 0) return digits;
  if (value < 0) return '-' + digits;
  return signed ? '+' + digits : digits;
}

function trimZeros(fixed: string): string {
  return fixed.includes('.') ? fixed.replace(/\.?0+$/, '') : fixed;
}

function nonFinite(value: number): string {
  if (Number.isNaN(value)) return '—';
  return value > 0 ? '∞' : '-∞';
}

function join(number: string, unit: string): QuantityParts {
  // The degree sign of a plane angle sits against the number (SI brochure, 9th edition, 5.4.3).
  const separator = unit === '°' ? '' : ' ';
  return { number, unit, text: unit ? `${number}${separator}${unit}` : number };
}

function pad2(n: number): string {
  return n < 10 ? '0' + n : String(n);
}

function clamp(n: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, n));
}

/** Outcome of {@link parseQuantity}: the value in the base unit, or what is wrong with the text. */
export type ParsedQuantity = { ok: true; value: number } | { ok: false; message: string };

/** Options for {@link parseQuantity}. */
export interface ParseQuantityOptions {
  /** Other spellings of the unit that are accepted, e.g. ['sps', 'S/s'] for a sample rate in Hz. */
  aliases?: string[];
}

// Powers of ten of the prefixes a person may type. `u` stands in for micro on keyboards without
// µ, and `K` is the common misspelling of kilo (no unit here is the kelvin).
const TYPED_PREFIXES: Record<string, number> = {
  f: -15, p: -12, n: -9, u: -6, 'µ': -6, 'μ': -6, m: -3, k: 3, K: 3, M: 6, G: 9, T: 12, P: 15,
};
const NUMBER_PATTERN = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))(?:[eE]([+-]?\d+))?\s*(.*)$/;
const GROUPED_THOUSANDS = /^([+-]?\d{1,3}(?:,\d{3})+)(?=$|[.\seE\p{L}])/u;

/**
 * Parse a quantity typed by a person into the base unit: `parseQuantity('4M', 'Hz')` and
 * `parseQuantity('4 MHz', 'Hz')` give 4e6, `parseQuantity('-3 dB', 'dB')` gives -3,
 * `parseQuantity('250u', 's')` gives 250e-6. Prefixes follow SI (m is milli, M is mega); log
 * units (dB...) and plain counts take no prefix. The unit itself may be left out.
 */
export function parseQuantity(text: string, unit: string, options: ParseQuantityOptions = {}): ParsedQuantity {
  const trimmed = String(text ?? '').trim();
  if (trimmed === '') return { ok: false, message: `is empty: enter a number${unit ? `, e.g. ${example(unit)}` : ''}` };
  // "4,000,000" reads unambiguously as grouped thousands; any other comma is probably a decimal comma.
  const ungrouped = trimmed.replace(GROUPED_THOUSANDS, (grouped) => grouped.replace(/,/g, ''));
  if (/^[+-]?\d*,\d/.test(ungrouped)) return { ok: false, message: `"${trimmed}" uses a decimal comma: write a point, e.g. ${example(unit)}` };
  const match = NUMBER_PATTERN.exec(ungrouped);
  if (!match) {
    return { ok: false, message: `"${trimmed}" is not a number${unit ? `, e.g. ${example(unit)}` : ''}` };
  }
  const [, mantissa, exponentText, suffix] = match;
  const exponent = exponentText ? Number(exponentText) : 0;
  const prefixPower = suffixPower(suffix, unit, options.aliases ?? []);
  if (prefixPower === null) {
    const expected = unit ? `expected ${acceptsPrefix(unit) ? `${unit} with an optional SI prefix` : unit}` : 'expected a plain number';
    return { ok: false, message: `"${suffix}" is not a unit this field takes (${expected}, e.g. ${example(unit)})` };
  }
  // Shifting the decimal exponent in text keeps typed decimals exact: 0.1 MHz is 100000, not 100000.00000000001.
  const value = Number(`${mantissa}e${exponent + prefixPower}`);
  if (!Number.isFinite(value)) return { ok: false, message: `"${trimmed}" is too large` };
  return { ok: true, value: Object.is(value, -0) ? 0 : value };
}

/** Power of ten of the suffix after the number (0 for none or the bare unit), or null when it is not one. */
function suffixPower(suffix: string, unit: string, aliases: string[]): number | null {
  if (suffix === '') return 0;
  const spellings = [unit, ...aliases].filter(Boolean).map((s) => s.toLowerCase());
  if (spellings.includes(suffix.toLowerCase())) return 0;
  if (!acceptsPrefix(unit)) return null;
  const power = TYPED_PREFIXES[suffix[0]];
  if (power === undefined) return null;
  const rest = suffix.slice(1).trim();
  if (rest === '' || spellings.includes(rest.toLowerCase())) return power;
  return null;
}

/** Whether a unit takes SI prefixes when typed (Hz, s, V, FS...), as opposed to dB, degrees or counts. */
function acceptsPrefix(unit: string): boolean {
  return !isLogUnit(unit) && !UNPREFIXED.has(unit) && unit !== 'symbols';
}

function example(unit: string): string {
  if (!unit) return '0.5';
  if (isLogUnit(unit)) return `-3 ${unit}`;
  if (!acceptsPrefix(unit)) return `12 ${unit}`;
  return unit === 's' ? '250 ms' : `4 M${unit}`;
}

// Binary suffixes a byte-size setting may carry, lower-cased; a bare number counts bytes.
const BYTE_SUFFIXES: Record<string, number> = { '': 1, b: 1, kib: 1024, mib: 1024 ** 2, gib: 1024 ** 3, tib: 1024 ** 4 };

/**
 * Parse a byte size such as `1073741824`, `512MiB` or `8 GiB` (binary suffixes only, any case)
 * into whole bytes; null when the text is not one. Fractions round down: `1.5KiB` is 1536 B.
 */
export function parseByteSize(text: string): number | null {
  const match = /^\s*(\d+(?:\.\d+)?)\s*([a-z]*)\s*$/i.exec(text);
  const factor = match ? BYTE_SUFFIXES[match[2]!.toLowerCase()] : undefined;
  if (!match || factor === undefined) return null;
  const value = Math.floor(Number(match[1]) * factor);
  return Number.isSafeInteger(value) ? value : null;
}
