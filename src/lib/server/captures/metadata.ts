/**
 * What describes a capture (name, datatype, layout, rates, visibility, tags, notes) and the rules
 * every way in shares: the one-request upload's query string, the pre-upload check, tus metadata,
 * PATCH and the synthesizer. Each rule throws an ApiError naming the field as the caller spelled
 * it (`sample_rate` in a query string, `sampleRate` in JSON).
 */
import { FormatError, checkLayoutFits, parseDatatype, parseLayout, type Datatype } from '@/dsp/formats';
import type { SampleType } from '@/dsp/types';
import { captureLimits, visibilities, type Capture, type DescribedField, type Visibility } from '@/contracts/capture';
import { badRequest, unprocessable, type ApiError } from '../api/errors';

export { visibilities, type Visibility };

/** Limits on descriptive fields (characters, counts). */
export const limits = captureLimits;

/** The full description of a capture's samples (the contract's, with the datatype parsed) and how it is shown. */
export type CaptureDescription = Pick<Capture, 'name' | 'layout' | 'sampleRate' | 'centerFrequency' | 'visibility' | 'tags' | 'notes' | 'annotations'> & {
  datatype: Datatype;
};

/** Part of a description, as one source (a request, a file header) states it. */
export type StatedFields = Partial<CaptureDescription>;

type Key = DescribedField;
/** How each field is spelled in the caller's input. */
export type FieldNames = Record<Key, string>;

export const queryFieldNames: FieldNames = {
  name: 'name',
  datatype: 'datatype',
  layout: 'layout',
  sampleRate: 'sample_rate',
  centerFrequency: 'center_frequency',
  visibility: 'visibility',
  tags: 'tags',
  notes: 'notes',
};

export const jsonFieldNames: FieldNames = {
  name: 'name',
  datatype: 'datatype',
  layout: 'layout',
  sampleRate: 'sampleRate',
  centerFrequency: 'centerFrequency',
  visibility: 'visibility',
  tags: 'tags',
  notes: 'notes',
};

/** A capture name: 1 to 200 characters after trimming. */
export function checkName(value: unknown, field: string): string {
  if (value === undefined || value === null || (typeof value === 'string' && value.trim() === '')) {
    throw badRequest('required', `${field} is required.`, field);
  }
  if (typeof value !== 'string') throw badRequest('invalid_field', `${field} must be text.`, field);
  const name = value.trim();
  if (name.length > limits.name) throw badRequest('too_long', `${field} must be at most ${limits.name} characters.`, field);
  return name;
}

/** A SigMF datatype string such as `cf32_le`. */
export function checkDatatype(value: unknown, field: string): Datatype {
  if (value === undefined || value === null || value === '') throw badRequest('required', `${field} is required (a SigMF datatype such as cf32_le).`, field);
  if (typeof value !== 'string') throw badRequest('invalid_field', `${field} must be a SigMF datatype string.`, field);
  try {
    return parseDatatype(value, field);
  } catch (error) {
    throw badRequest('invalid_field', (error as Error).message, field);
  }
}

/** A channel layout: complex, real or real-pair. */
export function checkLayout(value: unknown, field: string): SampleType {
  try {
    return parseLayout(String(value), field);
  } catch (error) {
    throw badRequest('invalid_field', (error as Error).message, field);
  }
}

function toNumber(value: unknown, field: string, what: string): number {
  const number = typeof value === 'string' && value.trim() !== '' ? Number(value) : value;
  if (typeof number !== 'number' || Number.isNaN(number)) throw badRequest('invalid_field', `${field} must be ${what}.`, field);
  if (!Number.isFinite(number)) throw badRequest('invalid_field', `${field} must be finite, got ${value}.`, field);
  return number;
}

/** A sample rate in Hz: finite, > 0, at most 1 THz. */
export function checkSampleRate(value: unknown, field: string): number {
  if (value === undefined || value === null || value === '') throw badRequest('required', `${field} is required (samples per second, Hz).`, field);
  const rate = toNumber(value, field, 'a number of samples per second (Hz)');
  if (rate <= 0) throw badRequest('invalid_field', `${field} must be > 0 Hz, got ${rate}.`, field);
  if (rate > limits.sampleRateHz) throw badRequest('invalid_field', `${field} must be at most ${limits.sampleRateHz} Hz.`, field);
  return rate;
}

/** A centre frequency in Hz (finite), or null when empty. */
export function checkCenterFrequency(value: unknown, field: string): number | null {
  if (value === undefined || value === null || value === '') return null;
  return toNumber(value, field, 'a frequency in Hz');
}

/** `private` or `team`. */
export function checkVisibility(value: unknown, field: string): Visibility {
  if ((visibilities as readonly unknown[]).includes(value)) return value as Visibility;
  throw badRequest('invalid_field', `${field} must be private or team.`, field);
}

/** Tags from an array or a comma-separated string: trimmed, unique, 1 to 40 characters, at most 20. */
export function checkTags(value: unknown, field: string): string[] {
  const list = typeof value === 'string' ? value.split(',') : value;
  if (!Array.isArray(list)) throw badRequest('invalid_field', `${field} must be a list of tags.`, field);
  const tags: string[] = [];
  for (const item of list) {
    if (typeof item !== 'string') throw badRequest('invalid_field', `${field} must hold text tags.`, field);
    const tag = item.trim();
    if (tag === '') continue;
    if (tag.length > limits.tag) throw badRequest('too_long', `${field}: "${tag.slice(0, 20)}..." is longer than ${limits.tag} characters.`, field);
    if (tag.includes(',')) throw badRequest('invalid_field', `${field}: a tag may not contain a comma.`, field);
    if (!tags.includes(tag)) tags.push(tag);
  }
  if (tags.length > limits.tags) throw badRequest('invalid_field', `${field}: at most ${limits.tags} tags.`, field);
  return tags;
}

/** Free-text notes, at most 10 000 characters. */
export function checkNotes(value: unknown, field: string): string {
  if (value === undefined || value === null) return '';
  if (typeof value !== 'string') throw badRequest('invalid_field', `${field} must be text.`, field);
  if (value.length > limits.notes) throw badRequest('too_long', `${field} must be at most ${limits.notes} characters.`, field);
  return value;
}

/** Raw inputs by field key; absent keys are not stated. */
export type RawFields = Partial<Record<Key, unknown>>;

/** Validates whichever fields are present (none is required here). */
export function parseStatedFields(raw: RawFields, names: FieldNames): StatedFields {
  const stated: StatedFields = {};
  const given = (key: Key) => raw[key] !== undefined && raw[key] !== null && raw[key] !== '';
  if (raw.name !== undefined) stated.name = checkName(raw.name, names.name);
  if (given('datatype')) stated.datatype = checkDatatype(raw.datatype, names.datatype);
  if (given('layout')) stated.layout = checkLayout(raw.layout, names.layout);
  if (given('sampleRate')) stated.sampleRate = checkSampleRate(raw.sampleRate, names.sampleRate);
  if (given('centerFrequency')) stated.centerFrequency = checkCenterFrequency(raw.centerFrequency, names.centerFrequency);
  if (given('visibility')) stated.visibility = checkVisibility(raw.visibility, names.visibility);
  if (raw.tags !== undefined) stated.tags = checkTags(raw.tags, names.tags);
  if (raw.notes !== undefined) stated.notes = checkNotes(raw.notes, names.notes);
  if (stated.datatype && stated.layout) layoutMustFit(stated.layout, stated.datatype, names.layout, 400);
  return stated;
}

function layoutMustFit(layout: SampleType, datatype: Datatype, field: string, status: 400 | 422): void {
  try {
    checkLayoutFits(layout, datatype, field);
  } catch (error) {
    const message = (error as FormatError).message;
    throw status === 400 ? badRequest('invalid_field', message, field) : unprocessable('invalid_field', message, field);
  }
}

function conflictError(field: string, fileSays: string, requestSays: string): ApiError {
  return unprocessable('conflicts_with_file', `${field}: the file says ${fileSays} but the request says ${requestSays}; leave ${field} out or make them agree.`, field);
}

/**
 * Completes a description from what the request states and what the file header says (the file
 * wins nothing silently: a disagreement on datatype, layout or sample rate is a 422 naming the
 * field). Requires name, datatype and sample rate from one of the two.
 */
export function completeDescription(request: StatedFields, file: StatedFields, names: FieldNames): CaptureDescription {
  for (const key of ['datatype', 'sampleRate'] as const) {
    const a = request[key];
    const b = file[key];
    if (a !== undefined && b !== undefined) {
      const same = key === 'datatype' ? (a as Datatype).name === (b as Datatype).name : a === b;
      if (!same) throw conflictError(names[key], describe(b), describe(a));
    }
  }
  const name = checkName(request.name ?? file.name, names.name);
  const datatype = request.datatype ?? file.datatype;
  if (!datatype) throw badRequest('required', `${names.datatype} is required (a SigMF datatype such as cf32_le).`, names.datatype);
  const sampleRate = request.sampleRate ?? file.sampleRate;
  if (sampleRate === undefined) throw badRequest('required', `${names.sampleRate} is required (samples per second, Hz).`, names.sampleRate);
  let layout = file.layout ?? request.layout ?? (datatype.complex ? 'complex' : 'real');
  // A two-channel WAV read as real-pair may be declared complex (I left, Q right) by the request;
  // the WAV reader then already produced a c datatype, so only a real/real-pair clash remains.
  if (request.layout !== undefined && file.layout !== undefined && request.layout !== file.layout) {
    throw conflictError(names.layout, file.layout, request.layout);
  }
  layout = request.layout ?? layout;
  layoutMustFit(layout, datatype, names.layout, file.datatype ? 422 : 400);
  return {
    name,
    datatype,
    layout,
    sampleRate,
    centerFrequency: request.centerFrequency !== undefined ? request.centerFrequency : (file.centerFrequency ?? null),
    visibility: request.visibility ?? file.visibility ?? 'private',
    tags: request.tags ?? file.tags ?? [],
    notes: request.notes ?? file.notes ?? '',
    annotations: file.annotations ?? [],
  };
}

function describe(value: unknown): string {
  if (typeof value === 'object' && value !== null && 'name' in value) return String((value as Datatype).name);
  return String(value);
}
