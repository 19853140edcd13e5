/**
 * The capture contract: one schema for a capture as the API presents it, and every narrower shape
 * (what describes one, what a run worker or the preview needs of it, the upload form's values)
 * derived from it with pick/extend, so a field is declared once. The database row stays in
 * src/lib/server/captures/rows.ts as the storage mapping, typed from these.
 */
import { z } from 'zod';
import { parseDatatype } from '../dsp/formats/datatype';
import type { SampleType, StreamFormat } from '../dsp/types';

/** Limits on descriptive fields (characters, counts, Hz). */
export const captureLimits = { name: 200, notes: 10_000, tag: 40, tags: 20, sampleRateHz: 1e12 } as const;

/** Who may see an owned item (captures and chains alike): its owner only, or the whole team. */
export const visibilities = ['private', 'team'] as const;
export const visibilitySchema = z.enum(visibilities);
export type Visibility = z.infer<typeof visibilitySchema>;

/** A user as items name their owner or author. */
export const personRefSchema = z.object({ id: z.string(), name: z.string() });
export type PersonRef = z.infer<typeof personRefSchema>;

/** How the samples' channels are laid out (the engine's SampleType). */
export const layoutSchema = z.enum(['complex', 'real', 'real-pair']);
// The engine owns SampleType; this type fails to compile if the two ever differ.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
type Assert<T extends true> = T;
export type LayoutIsSampleType = Assert<Same<z.infer<typeof layoutSchema>, SampleType>>;

/** Where a capture came from. */
export const captureSourceSchema = z.enum(['uploaded', 'synthesized']);
export type CaptureSource = z.infer<typeof captureSourceSchema>;

/** A SigMF datatype string such as `cf32_le`, checked by the engine's parser. */
export const datatypeSchema = z.string().superRefine((value, ctx) => {
  try {
    parseDatatype(value);
  } catch (error) {
    ctx.addIssue({ code: z.ZodIssueCode.custom, message: (error as Error).message.replace(/^datatype: /, '') });
  }
});

/** What describes a capture's samples and how it is shown: the fields a user states. */
export const captureDescriptionSchema = z.object({
  name: z.string().trim().min(1).max(captureLimits.name),
  datatype: datatypeSchema,
  layout: layoutSchema,
  /** Samples per second (Hz). */
  sampleRate: z.number().finite().positive().max(captureLimits.sampleRateHz),
  /** RF frequency of 0 Hz in the capture (Hz), or null when unknown. */
  centerFrequency: z.number().finite().nullable(),
  visibility: visibilitySchema,
  tags: z.array(z.string().trim().min(1).max(captureLimits.tag)).max(captureLimits.tags),
  notes: z.string().max(captureLimits.notes),
  /** SigMF annotation objects (`core:sample_start`, ...). */
  annotations: z.array(z.record(z.unknown())),
});

/**
 * What the owner may change of a capture (a PATCH body): descriptive fields only, each optional.
 * Annotations stay unknown here: the server checks them as SigMF against the capture's length.
 */
export const captureChangesSchema = captureDescriptionSchema
  .pick({ name: true, notes: true, tags: true, visibility: true, centerFrequency: true })
  .extend({ annotations: z.array(z.unknown()) })
  .partial();
export type CaptureChanges = z.infer<typeof captureChangesSchema>;

/** A capture as the API presents it: the base every other capture shape is cut from. */
export const captureSchema = captureDescriptionSchema.extend({
  id: z.string(),
  owner: personRefSchema,
  sampleCount: z.number().int().nonnegative(),
  /** Bytes stored. */
  byteSize: z.number().int().nonnegative(),
  /** Bytes per sample, every channel. */
  bytesPerSample: z.number().int().positive(),
  /** sampleCount / sampleRate (s). */
  durationSeconds: z.number().nonnegative(),
  /** SHA-256 (hex) of the stored sample bytes. */
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  source: captureSourceSchema,
  /** The synthesizer spec (defaults filled in) of a synthesized capture, else null. */
  synthSpec: z.unknown().nullable(),
  /** ISO-8601 UTC. */
  createdAt: z.string(),
  permissions: z.object({ update: z.boolean(), delete: z.boolean() }),
});
export type Capture = z.infer<typeof captureSchema>;

/** A user's storage against their quota (bytes), shown beside the captures list. */
export const storageUsageSchema = z.object({
  storedBytes: z.number().nonnegative(),
  quotaBytes: z.number().nonnegative(),
  largestCaptureBytes: z.number().nonnegative(),
  captureCount: z.number().int().nonnegative(),
});
export type StorageUsage = z.infer<typeof storageUsageSchema>;

/** One page of the captures list, with the user's storage usage. */
export const captureListSchema = z.object({
  items: z.array(captureSchema),
  total: z.number().int().nonnegative(),
  page: z.number().int().positive(),
  pageSize: z.number().int().positive(),
  usage: storageUsageSchema,
});
export type CaptureList = z.infer<typeof captureListSchema>;

/** The fields that say what stream a capture feeds into a chain. */
export const captureFormatSchema = captureSchema.pick({ sampleRate: true, layout: true, centerFrequency: true });
export type CaptureFormat = z.infer<typeof captureFormatSchema>;

/** The stream format a capture feeds into a chain (the one conversion; no centre frequency when unknown). */
export function streamFormatOf(capture: CaptureFormat): StreamFormat {
  const format: StreamFormat = { sampleRate: capture.sampleRate, sampleType: capture.layout };
  if (capture.centerFrequency !== null) format.centerFrequency = capture.centerFrequency;
  return format;
}

/** What a run worker needs to read a capture: where its bytes are and how to decode them. */
export const runJobCaptureSchema = captureSchema
  .pick({ id: true, name: true, datatype: true, layout: true, sampleRate: true, centerFrequency: true, sampleCount: true })
  .extend({ storageKey: z.string() });
export type RunJobCapture = z.infer<typeof runJobCaptureSchema>;

/** What the notebook's preview worker needs to fetch and decode a capture's head. */
export const previewCaptureSchema = captureSchema.pick({
  id: true, datatype: true, layout: true, sampleRate: true, centerFrequency: true, sampleCount: true, bytesPerSample: true,
});
export type PreviewCapture = z.infer<typeof previewCaptureSchema>;

/** A checked upload description, in the units the API takes, with the sample count of the file. */
export const uploadDescriptionSchema = captureDescriptionSchema
  .omit({ annotations: true })
  .extend({ sampleCount: z.number().int().nonnegative() });
export type UploadDescription = z.infer<typeof uploadDescriptionSchema>;

/** The upload form's values: the description as typed (numbers and tags still text). */
export const uploadValuesSchema = captureDescriptionSchema
  .pick({ name: true, datatype: true, layout: true, visibility: true, notes: true })
  .extend({ datatype: z.string(), sampleRate: z.string(), centerFrequency: z.string(), tags: z.string() });
export type UploadValues = z.infer<typeof uploadValuesSchema>;

/** The described fields a request or a file may state (each way in spells them its own way). */
export type DescribedField = keyof z.infer<typeof uploadValuesSchema>;
