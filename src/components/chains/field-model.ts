/**
 * What input each stage parameter needs, read off the kind's zod schema: numbers (with their
 * unit, integer or not, optional), choices, switches, lists of numbers (pasted taps) and sets of
 * choices (measurements). A discriminated union (the filter's `design`) picks which variant's
 * fields exist; a few parameters matter only for some settings of another and are hidden then.
 */
import { z } from 'zod';
import type { FieldInfo, StageDefinition } from '@/dsp/types';

export type FieldControl =
  | { control: 'number'; integer: boolean; optional: boolean; min?: number; max?: number }
  | { control: 'select'; options: string[] }
  | { control: 'checkbox' }
  | { control: 'number-list'; min?: number; max?: number }
  | { control: 'choice-set'; options: string[] };

/** One parameter of a stage form. */
export type FieldSpec = FieldControl & {
  name: string;
  label: string;
  /** Base unit (Hz, dB, s, samples...); empty for pure numbers and choices. */
  unit: string;
  help?: string;
  /** The schema's default, when it has one. */
  defaultValue?: unknown;
};

/** The variant switch of a discriminated-union schema. */
export interface VariantSwitch {
  name: string;
  options: string[];
  /** The variant the parameters select (the first when they name none or an unknown one). */
  value: string;
}

/** Fields of a stage form for the given parameters, and the variant switch if the kind has one. */
export interface StageForm {
  variant?: VariantSwitch;
  fields: FieldSpec[];
}

type AnyZod = z.ZodTypeAny;

/** Strips defaults, optionals, nullables and refinements; reports what was stripped. */
function unwrap(schema: AnyZod): { inner: AnyZod; optional: boolean; defaultValue?: unknown } {
  let inner = schema;
  let optional = false;
  let defaultValue: unknown;
  for (;;) {
    if (inner instanceof z.ZodDefault) {
      defaultValue = inner._def.defaultValue();
      inner = inner._def.innerType;
    } else if (inner instanceof z.ZodOptional || inner instanceof z.ZodNullable) {
      optional = true;
      inner = inner.unwrap();
    } else if (inner instanceof z.ZodEffects) {
      inner = inner._def.schema;
    } else {
      return { inner, optional, defaultValue };
    }
  }
}

function numberBounds(schema: z.ZodNumber): { integer: boolean; min?: number; max?: number } {
  const out: { integer: boolean; min?: number; max?: number } = { integer: false };
  for (const check of schema._def.checks) {
    if (check.kind === 'int') out.integer = true;
    if (check.kind === 'min') out.min = check.value;
    if (check.kind === 'max') out.max = check.value;
  }
  return out;
}

/** The control for one parameter schema; undefined for shapes the form cannot edit (literals). */
export function controlOf(schema: AnyZod): (FieldControl & { defaultValue?: unknown }) | undefined {
  const { inner, optional, defaultValue } = unwrap(schema);
  if (inner instanceof z.ZodNumber) return { control: 'number', optional, ...numberBounds(inner), defaultValue };
  if (inner instanceof z.ZodEnum) return { control: 'select', options: [...inner.options] as string[], defaultValue };
  if (inner instanceof z.ZodBoolean) return { control: 'checkbox', defaultValue };
  if (inner instanceof z.ZodArray) {
    const element = unwrap(inner.element).inner;
    if (element instanceof z.ZodNumber) return { control: 'number-list', min: inner._def.minLength?.value, max: inner._def.maxLength?.value, defaultValue };
    if (element instanceof z.ZodEnum) return { control: 'choice-set', options: [...element.options] as string[], defaultValue };
  }
  return undefined;
}

/** The object schema of a kind, or the variants of its discriminated union. */
function shapeOf(schema: AnyZod): { object?: z.AnyZodObject; union?: { discriminator: string; variants: Map<string, z.AnyZodObject> } } {
  const { inner } = unwrap(schema);
  if (inner instanceof z.ZodObject) return { object: inner };
  if (inner instanceof z.ZodDiscriminatedUnion) {
    const variants = new Map<string, z.AnyZodObject>();
    for (const [value, option] of inner.optionsMap) variants.set(String(value), option as z.AnyZodObject);
    return { union: { discriminator: inner.discriminator, variants } };
  }
  return {};
}

function fieldSpec(name: string, schema: AnyZod, info: FieldInfo | undefined): FieldSpec | undefined {
  const control = controlOf(schema);
  if (!control) return undefined;
  return { ...control, name, label: info?.label ?? name, unit: info?.unit ?? '', help: info?.help };
}

/** The form of a stage kind for its current parameters (which variant, which fields). */
export function stageForm(definition: StageDefinition<any>, params: Record<string, unknown>): StageForm {
  const { object, union } = shapeOf(definition.schema);
  if (union) {
    const options = [...union.variants.keys()];
    const chosen = typeof params[union.discriminator] === 'string' && union.variants.has(params[union.discriminator] as string) ? (params[union.discriminator] as string) : options[0];
    const shape = union.variants.get(chosen)!.shape as Record<string, AnyZod>;
    const fields = Object.entries(shape)
      .filter(([name]) => name !== union.discriminator)
      .map(([name, schema]) => fieldSpec(name, schema, definition.fields[name]))
      .filter((f): f is FieldSpec => f !== undefined);
    return { variant: { name: union.discriminator, options, value: chosen }, fields };
  }
  if (!object) return { fields: [] };
  const fields = Object.entries(object.shape as Record<string, AnyZod>)
    .map(([name, schema]) => fieldSpec(name, schema, definition.fields[name]))
    .filter((f): f is FieldSpec => f !== undefined);
  return { fields };
}

/**
 * Parameters after switching a union kind to another variant: fields both variants have keep
 * their values, the others take the new variant's defaults (or values read off the rate via
 * `seed`), fields the new variant lacks are dropped.
 */
export function switchVariant(definition: StageDefinition<any>, params: Record<string, unknown>, value: string, seed: Record<string, unknown> = {}): Record<string, unknown> {
  const { union } = shapeOf(definition.schema);
  if (!union || !union.variants.has(value)) return params;
  const shape = union.variants.get(value)!.shape as Record<string, AnyZod>;
  const out: Record<string, unknown> = { [union.discriminator]: value };
  for (const [name, schema] of Object.entries(shape)) {
    if (name === union.discriminator) continue;
    if (params[name] !== undefined && controlOf(schema)?.control === controlOf(schemaFor(definition, params, name) ?? schema)?.control) out[name] = params[name];
    else if (seed[name] !== undefined) out[name] = seed[name];
    else {
      const d = unwrap(schema).defaultValue;
      if (d !== undefined) out[name] = d;
    }
  }
  return out;
}

/** The schema of one parameter under the variant `params` select (undefined when it has none). */
function schemaFor(definition: StageDefinition<any>, params: Record<string, unknown>, name: string): AnyZod | undefined {
  const { object, union } = shapeOf(definition.schema);
  if (object) return (object.shape as Record<string, AnyZod>)[name];
  if (!union) return undefined;
  const variant = union.variants.get(String(params[union.discriminator]));
  return variant ? (variant.shape as Record<string, AnyZod>)[name] : undefined;
}

/**
 * Parameters that mean nothing under the current settings of others, hidden from the form (their
 * values stay in the document): a Kaiser beta without a Kaiser window, a cut-off on a band-pass...
 */
export function hiddenFields(kind: string, params: Record<string, unknown>): Set<string> {
  const hidden = new Set<string>();
  const hide = (...names: string[]) => names.forEach((n) => hidden.add(n));
  if ('window' in params && params.window !== 'kaiser') hide('beta');
  switch (kind) {
    case 'filter':
      if (params.response === 'bandpass' || params.response === 'bandstop') hide('cutoff');
      else hide('low', 'high');
      if (params.design === 'iir' && params.family !== 'chebyshev1') hide('ripple');
      break;
    case 'gain':
      if (params.mode === 'fixed') hide('targetDb', 'estimateSamples');
      else hide('gainDb');
      break;
    case 'dc-remove':
      if (params.method === 'mean') hide('pole');
      else hide('estimateSamples');
      break;
    case 'iq-correct':
      if (params.mode === 'blind') hide('gainDb', 'phaseDeg');
      else hide('estimateSamples');
      break;
    case 'measure':
      if (!(Array.isArray(params.measurements) && params.measurements.includes('channel-power'))) hide('bandLow', 'bandHigh');
      break;
  }
  return hidden;
}
