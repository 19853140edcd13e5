/**
 * SigMF metadata (`.sigmf-meta`) read and written with the core fields of SigMF v1.2
 * (GNU Radio Foundation, "SigMF: The Signal Metadata Format Specification", v1.2.0, 2024):
 * global `core:datatype` and `core:version` (required), `core:sample_rate`, `core:description`,
 * `core:author`, `core:hw`, `core:sha512`, `core:num_channels`; captures with `core:sample_start`
 * (required), `core:frequency`, `core:datetime`; annotations with `core:sample_start` (required),
 * `core:sample_count`, `core:freq_lower_edge`, `core:freq_upper_edge`, `core:label`, `core:comment`.
 * Other keys (extensions) are kept as they are, so reading and writing a file loses nothing.
 */
import type { SampleType } from '../types';
import { FormatError, parseDatatype, type Datatype } from './datatype';
import { layoutFromDatatype } from './layout';

type Extra = Record<string, unknown>;

export interface SigmfGlobal {
  datatype: string;
  version: string;
  /** Samples per second (Hz). */
  sampleRate?: number;
  description?: string;
  author?: string;
  hw?: string;
  /** SHA-512 of the data file, 128 hex digits. */
  sha512?: string;
  numChannels?: number;
  /** Keys other than the core fields above, kept unchanged. */
  extra?: Extra;
}

export interface SigmfCapture {
  /** First sample (index into the data file) this segment describes. */
  sampleStart: number;
  /** Centre frequency (Hz) of the segment. */
  frequency?: number;
  /** ISO-8601 time of the first sample. */
  datetime?: string;
  extra?: Extra;
}

export interface SigmfAnnotation {
  sampleStart: number;
  sampleCount?: number;
  /** Lower and upper edge (Hz) of the annotated signal. */
  freqLowerEdge?: number;
  freqUpperEdge?: number;
  label?: string;
  comment?: string;
  extra?: Extra;
}

export interface SigmfMeta {
  global: SigmfGlobal;
  captures: SigmfCapture[];
  annotations: SigmfAnnotation[];
}

/** The SigMF version written by buildSigmfMeta. */
export const SIGMF_VERSION = '1.2.0';

const GLOBAL_KEYS = ['core:datatype', 'core:version', 'core:sample_rate', 'core:description', 'core:author', 'core:hw', 'core:sha512', 'core:num_channels'];
const CAPTURE_KEYS = ['core:sample_start', 'core:frequency', 'core:datetime'];
const ANNOTATION_KEYS = ['core:sample_start', 'core:sample_count', 'core:freq_lower_edge', 'core:freq_upper_edge', 'core:label', 'core:comment'];

/** Parse and validate `.sigmf-meta` text or an already parsed object; FormatError names the field. */
export function parseSigmfMeta(input: string | unknown): SigmfMeta {
  let doc: unknown = input;
  if (typeof input === 'string') {
    try {
      doc = JSON.parse(input);
    } catch (error) {
      throw new FormatError(`sigmf-meta: not valid JSON (${(error as Error).message})`, 'sigmf-meta');
    }
  }
  const top = asObject(doc, 'sigmf-meta');
  const g = asObject(top.global, 'global');
  const datatype = requiredString(g, 'core:datatype', 'global');
  parseDatatype(datatype, 'global.core:datatype');
  const global: SigmfGlobal = {
    datatype,
    version: requiredString(g, 'core:version', 'global'),
    sampleRate: optionalNumber(g, 'core:sample_rate', 'global', (v) => v > 0, 'must be > 0 Hz'),
    description: optionalString(g, 'core:description', 'global'),
    author: optionalString(g, 'core:author', 'global'),
    hw: optionalString(g, 'core:hw', 'global'),
    sha512: optionalString(g, 'core:sha512', 'global'),
    numChannels: optionalNumber(g, 'core:num_channels', 'global', (v) => Number.isInteger(v) && v >= 1, 'must be a whole number >= 1'),
    extra: extraKeys(g, GLOBAL_KEYS),
  };
  if (global.sha512 !== undefined && !/^[0-9a-fA-F]{128}$/.test(global.sha512)) {
    throw new FormatError('global.core:sha512: must be 128 hexadecimal digits', 'global.core:sha512');
  }
  const captures = asArray(top.captures ?? [], 'captures').map((entry, i): SigmfCapture => {
    const where = `captures[${i}]`;
    const c = asObject(entry, where);
    const datetime = optionalString(c, 'core:datetime', where);
    if (datetime !== undefined && Number.isNaN(Date.parse(datetime))) {
      throw new FormatError(`${where}.core:datetime: "${datetime}" is not an ISO-8601 date and time`, `${where}.core:datetime`);
    }
    return {
      sampleStart: sampleIndex(c, 'core:sample_start', where, true)!,
      frequency: optionalNumber(c, 'core:frequency', where),
      datetime,
      extra: extraKeys(c, CAPTURE_KEYS),
    };
  });
  for (let i = 1; i < captures.length; i++) {
    if (captures[i].sampleStart <= captures[i - 1].sampleStart) {
      throw new FormatError(`captures[${i}].core:sample_start: captures must be in increasing sample_start order`, `captures[${i}].core:sample_start`);
    }
  }
  const annotations = asArray(top.annotations ?? [], 'annotations').map((entry, i): SigmfAnnotation => {
    const where = `annotations[${i}]`;
    const a = asObject(entry, where);
    const annotation: SigmfAnnotation = {
      sampleStart: sampleIndex(a, 'core:sample_start', where, true)!,
      sampleCount: sampleIndex(a, 'core:sample_count', where, false),
      freqLowerEdge: optionalNumber(a, 'core:freq_lower_edge', where),
      freqUpperEdge: optionalNumber(a, 'core:freq_upper_edge', where),
      label: optionalString(a, 'core:label', where),
      comment: optionalString(a, 'core:comment', where),
      extra: extraKeys(a, ANNOTATION_KEYS),
    };
    if (annotation.freqLowerEdge !== undefined && annotation.freqUpperEdge !== undefined && annotation.freqLowerEdge > annotation.freqUpperEdge) {
      throw new FormatError(`${where}.core:freq_lower_edge: ${annotation.freqLowerEdge} Hz is above core:freq_upper_edge ${annotation.freqUpperEdge} Hz`, `${where}.core:freq_lower_edge`);
    }
    return annotation;
  });
  return { global: dropUndefined(global), captures: captures.map(dropUndefined), annotations: annotations.map(dropUndefined) };
}

/** Datatype and channel layout a parsed SigMF description implies. */
export function sigmfSampleShape(meta: SigmfMeta): { datatype: Datatype; layout: SampleType } {
  const datatype = parseDatatype(meta.global.datatype, 'global.core:datatype');
  return { datatype, layout: layoutFromDatatype(datatype, meta.global.numChannels ?? 1, 'global.core:num_channels') };
}

/** The JSON object of a `.sigmf-meta` file (core keys first, extensions kept). */
export function buildSigmfMeta(meta: SigmfMeta): Record<string, unknown> {
  const g = meta.global;
  parseDatatype(g.datatype, 'global.core:datatype');
  if (g.sampleRate !== undefined && !(Number.isFinite(g.sampleRate) && g.sampleRate > 0)) {
    throw new FormatError(`global.core:sample_rate: must be > 0 Hz, got ${g.sampleRate}`, 'global.core:sample_rate');
  }
  const global = withDefined({
    'core:datatype': g.datatype,
    'core:version': g.version || SIGMF_VERSION,
    'core:sample_rate': g.sampleRate,
    'core:num_channels': g.numChannels,
    'core:description': g.description,
    'core:author': g.author,
    'core:hw': g.hw,
    'core:sha512': g.sha512,
    ...g.extra,
  });
  const captures = meta.captures.map((c) => withDefined({
    'core:sample_start': c.sampleStart, 'core:frequency': c.frequency, 'core:datetime': c.datetime, ...c.extra,
  }));
  const annotations = meta.annotations.map((a) => withDefined({
    'core:sample_start': a.sampleStart,
    'core:sample_count': a.sampleCount,
    'core:freq_lower_edge': a.freqLowerEdge,
    'core:freq_upper_edge': a.freqUpperEdge,
    'core:label': a.label,
    'core:comment': a.comment,
    ...a.extra,
  }));
  const doc = { global, captures, annotations };
  parseSigmfMeta(doc); // what we write must read back
  return doc;
}

/** `.sigmf-meta` file text for a description (two-space indented JSON, final newline). */
export function formatSigmfMeta(meta: SigmfMeta): string {
  return `${JSON.stringify(buildSigmfMeta(meta), null, 2)}\n`;
}

function asObject(value: unknown, field: string): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new FormatError(`${field}: must be a JSON object${value === undefined ? ' (missing)' : ''}`, field);
  }
  return value as Record<string, unknown>;
}

function asArray(value: unknown, field: string): unknown[] {
  if (!Array.isArray(value)) throw new FormatError(`${field}: must be a JSON array`, field);
  return value;
}

function requiredString(obj: Record<string, unknown>, key: string, where: string): string {
  const value = obj[key];
  if (value === undefined) throw new FormatError(`${where}.${key}: missing (required)`, `${where}.${key}`);
  if (typeof value !== 'string' || value.length === 0) throw new FormatError(`${where}.${key}: must be a non-empty string`, `${where}.${key}`);
  return value;
}

function optionalString(obj: Record<string, unknown>, key: string, where: string): string | undefined {
  const value = obj[key];
  if (value === undefined) return undefined;
  if (typeof value !== 'string') throw new FormatError(`${where}.${key}: must be a string`, `${where}.${key}`);
  return value;
}

function optionalNumber(obj: Record<string, unknown>, key: string, where: string, ok?: (v: number) => boolean, rule?: string): number | undefined {
  const value = obj[key];
  if (value === undefined) return undefined;
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new FormatError(`${where}.${key}: must be a finite number, got ${JSON.stringify(value)}`, `${where}.${key}`);
  }
  if (ok && !ok(value)) throw new FormatError(`${where}.${key}: ${rule}, got ${value}`, `${where}.${key}`);
  return value;
}

function sampleIndex(obj: Record<string, unknown>, key: string, where: string, required: boolean): number | undefined {
  if (obj[key] === undefined && required) throw new FormatError(`${where}.${key}: missing (required)`, `${where}.${key}`);
  return optionalNumber(obj, key, where, (v) => Number.isSafeInteger(v) && v >= 0, 'must be a whole number of samples >= 0');
}

function extraKeys(obj: Record<string, unknown>, known: string[]): Extra | undefined {
  const extra: Extra = {};
  for (const [key, value] of Object.entries(obj)) if (!known.includes(key)) extra[key] = value;
  return Object.keys(extra).length ? extra : undefined;
}

function withDefined(obj: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(obj).filter(([, v]) => v !== undefined));
}

function dropUndefined<T extends object>(obj: T): T {
  return withDefined(obj as Record<string, unknown>) as T;
}
