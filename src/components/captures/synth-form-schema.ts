/**
 * The synthesizer form derived from the engine's spec schema (synthSpecObject) and its labels
 * (synthFields): a field model for the renderer, a zod schema for the resolver that reads the
 * typed text (SI prefixes allowed) into numbers and then applies the spec's own checks, and the
 * conversions between a spec and the form's text values. Nothing here knows the fields by name
 * except `datatype`, which is shown as a choice of the SigMF datatypes.
 */
import { z } from 'zod';
import { synthSpecObject, synthCarrierSchema } from '@/dsp/synth/spec';
import { synthSpecSchema } from '@/dsp/synth/validate';
import { synthFields } from '@/dsp/synth/fields';
import { SIGMF_DATATYPES } from '@/dsp/formats/datatype';
import { formatQuantity, parseQuantity } from '@/lib/units';

/** One node of the form, as the renderer draws it. */
export type FieldModel =
  | { kind: 'number'; key: string; path: string; label: string; unit?: string; help?: string; integer: boolean; optional: boolean }
  | { kind: 'text'; key: string; path: string; label: string; help?: string; optional: boolean }
  | { kind: 'choice'; key: string; path: string; label: string; help?: string; options: string[] }
  | { kind: 'flag'; key: string; path: string; label: string; help?: string }
  | { kind: 'group'; key: string; path: string; label: string; fields: FieldModel[] }
  | { kind: 'list'; key: string; path: string; label: string; item: FieldModel; max?: number }
  | { kind: 'variants'; key: string; path: string; label: string; discriminator: string; variants: Record<string, FieldModel[]> };

type AnyZod = z.ZodTypeAny;

/** The schema under defaults, optionals and refinements, and whether it may be left out. */
function unwrap(schema: AnyZod): { inner: AnyZod; optional: boolean } {
  let inner = schema;
  let optional = false;
  for (;;) {
    if (inner instanceof z.ZodDefault) inner = inner._def.innerType;
    else if (inner instanceof z.ZodOptional) {
      optional = true;
      inner = inner.unwrap();
    } else if (inner instanceof z.ZodEffects) inner = inner._def.schema;
    else return { inner, optional };
  }
}

/** Label key of a path: array indices dropped, as synthFields keys them (`tones.frequency`). */
function infoOf(path: string) {
  return synthFields[path] ?? { label: path.split('.').pop() ?? path };
}

function modelOf(schema: AnyZod, key: string, path: string): FieldModel {
  const { inner, optional } = unwrap(schema);
  const info = infoOf(path);
  const base = { key, path, label: info.label, help: info.help };
  if (inner instanceof z.ZodNumber) return { ...base, kind: 'number', unit: info.unit, integer: inner.isInt, optional };
  if (key === 'datatype') return { ...base, kind: 'choice', options: [...SIGMF_DATATYPES] };
  if (inner instanceof z.ZodString) return { ...base, kind: 'text', optional };
  if (inner instanceof z.ZodEnum) return { ...base, kind: 'choice', options: [...inner.options] };
  if (inner instanceof z.ZodLiteral) return { ...base, kind: 'choice', options: [String(inner.value)] };
  if (inner instanceof z.ZodBoolean) return { ...base, kind: 'flag' };
  if (inner instanceof z.ZodObject) return { key, path, label: info.label, kind: 'group', fields: objectFields(inner, path) };
  if (inner instanceof z.ZodArray) return { key, path, label: info.label, kind: 'list', item: modelOf(inner.element, key, path), max: inner._def.maxLength?.value };
  if (inner instanceof z.ZodDiscriminatedUnion) {
    const discriminator: string = inner.discriminator;
    const variants: Record<string, FieldModel[]> = {};
    for (const option of inner.options as z.ZodObject<z.ZodRawShape>[]) {
      const tag = option.shape[discriminator];
      const values: string[] = tag instanceof z.ZodEnum ? [...tag.options] : [String((tag as z.ZodLiteral<string>).value)];
      const fields = objectFields(option, path).filter((f) => f.key !== discriminator);
      for (const value of values) variants[value] = fields;
    }
    return { key, path, label: info.label, kind: 'variants', discriminator, variants };
  }
  throw new Error(`synth form: no field kind for ${path}`);
}

function objectFields(object: z.ZodObject<z.ZodRawShape>, path: string): FieldModel[] {
  return Object.entries(object.shape).map(([key, schema]) => modelOf(schema as AnyZod, key, path ? `${path}.${key}` : key));
}

/** The whole form's field model, in the spec's order. */
export const synthFormModel: FieldModel[] = objectFields(synthSpecObject, '');

/** A number typed with its unit (SI prefixes allowed); its message names the problem. */
function typedNumber(field: Extract<FieldModel, { kind: 'number' }>) {
  return z.string().transform((text, ctx) => {
    if (field.optional && text.trim() === '') return undefined;
    const parsed = parseQuantity(text, field.unit ?? '');
    if (!parsed.ok) {
      ctx.addIssue({ code: z.ZodIssueCode.custom, message: parsed.message });
      return z.NEVER;
    }
    return parsed.value;
  });
}

function formSchemaOf(field: FieldModel): AnyZod {
  switch (field.kind) {
    case 'number':
      return typedNumber(field);
    case 'text':
      return z.string().transform((t) => (field.optional && t.trim() === '' ? undefined : t));
    case 'choice':
      return z.string();
    case 'flag':
      return z.boolean();
    case 'group':
      return z.object(Object.fromEntries(field.fields.map((f) => [f.key, formSchemaOf(f)])));
    case 'list':
      return z.array(formSchemaOf(field.item));
    case 'variants':
      return z.object({ [field.discriminator]: z.string() }).passthrough().transform((value, ctx) => {
        const tag = String(value[field.discriminator]);
        const fields = field.variants[tag];
        if (!fields) {
          ctx.addIssue({ code: z.ZodIssueCode.custom, path: [field.discriminator], message: `unknown choice "${tag}"` });
          return z.NEVER;
        }
        const parsed = z.object(Object.fromEntries(fields.map((f) => [f.key, formSchemaOf(f)]))).safeParse(value);
        if (!parsed.success) {
          for (const issue of parsed.error.issues) ctx.addIssue({ ...issue, code: z.ZodIssueCode.custom, message: issue.message });
          return z.NEVER;
        }
        return { [field.discriminator]: tag, ...parsed.data };
      });
  }
}

/**
 * The resolver's schema: text values in, a checked spec out. The second stage is the engine's
 * synthSpecSchema itself, so the form refuses exactly what the server refuses (Nyquist, datatype
 * against layout...), with the message on the field it concerns.
 */
export const synthFormSchema = z
  .object(Object.fromEntries(synthFormModel.map((f) => [f.key, formSchemaOf(f)])))
  .pipe(synthSpecSchema);

/** Form values: the spec with every number as the text in the field. */
export type SynthFormValues = Record<string, unknown>;

function numberText(value: unknown, unit: string | undefined): string {
  if (typeof value !== 'number' || !Number.isFinite(value)) return '';
  // A prefix reads well on frequencies and times; fractions of full scale stay plain (0.018, not 18 mFS).
  if (unit && unit !== 'FS' && unit !== 'symbols' && unit !== 'bits' && !/^dB|deg/.test(unit)) return formatQuantity(value, unit, { significant: 12 });
  return String(value);
}

function valuesOf(field: FieldModel, value: unknown): unknown {
  switch (field.kind) {
    case 'number':
      return numberText(value, field.unit);
    case 'text':
      return typeof value === 'string' ? value : '';
    case 'choice':
      return String(value ?? field.options[0]);
    case 'flag':
      return Boolean(value);
    case 'group':
      return Object.fromEntries(field.fields.map((f) => [f.key, valuesOf(f, (value as Record<string, unknown> | undefined)?.[f.key])]));
    case 'list':
      return Array.isArray(value) ? value.map((v) => valuesOf(field.item, v)) : [];
    case 'variants': {
      const object = (value ?? {}) as Record<string, unknown>;
      const tag = String(object[field.discriminator] ?? Object.keys(field.variants)[0]);
      const fields = field.variants[tag] ?? [];
      return { [field.discriminator]: tag, ...Object.fromEntries(fields.map((f) => [f.key, valuesOf(f, object[f.key])])) };
    }
  }
}

/** Form values of a spec (defaults filled in first, so every field shows a value). */
export function formValuesOf(spec: unknown): SynthFormValues {
  const filled = synthSpecObject.parse(spec ?? {});
  return Object.fromEntries(synthFormModel.map((f) => [f.key, valuesOf(f, (filled as Record<string, unknown>)[f.key])]));
}

/** Form values of one new item of a list or variant (its schema's defaults). */
export function newItemValues(field: FieldModel, tag?: string): unknown {
  if (field.kind === 'variants') {
    const carrier = synthCarrierSchema.options.find((o) => o.shape.modulation.safeParse(tag).success);
    return valuesOf(field, carrier ? carrier.parse({ modulation: tag }) : { [field.discriminator]: tag });
  }
  if (field.kind === 'group') return valuesOf(field, {});
  return valuesOf(field, undefined);
}

/** The react-hook-form field name of an API error path: `spec.tones[0].frequency` -> `tones.0.frequency`. */
export function formNameOf(apiField: string): string {
  return apiField.replace(/^spec\./, '').replace(/\[(\d+)\]/g, '.$1');
}
