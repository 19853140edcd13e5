/**
 * Specifications and verdicts: a specification is a named, versioned set of limits on readouts
 * (names from the engine's readout catalogue); a run checked against one gets a verdict per limit
 * and an overall verdict. The arithmetic lives here, pure, so the server, the report and the pages
 * judge a value the same way.
 */
import { z } from 'zod';
import { readoutEntry, READOUT_NAMES } from '../dsp/measure/catalogue';
import { personRefSchema, visibilitySchema } from './capture';

export { READOUT_CATALOGUE, READOUT_NAMES, readoutEntry } from '../dsp/measure/catalogue';
export type { ReadoutCatalogueEntry } from '../dsp/measure/catalogue';

/** Limits on a specification's free-form fields (characters, counts). */
export const specLimits = { name: 200, description: 2_000, note: 500, limits: 200, testPoint: 100 } as const;

/** A limit value: finite, in the readout's unit. */
const limitValue = z.number({ invalid_type_error: 'must be a number' }).finite('must be a finite number');

/** One limit as the API takes and gives it: a readout (and test point), a lower and/or upper limit, a note. */
export const specLimitSchema = z
  .object({
    /** A readout name from the catalogue, e.g. "Image rejection". */
    measurement: z.string().max(100).refine((name) => readoutEntry(name) !== undefined, {
      message: `is not a readout Quadrille measures (one of: ${READOUT_NAMES.slice(0, 6).join(', ')}, ...)`,
    }),
    /** Stage id of the test point whose readout is meant; absent: any test point with that readout (the first). */
    test_point: z.string().trim().min(1).max(specLimits.testPoint).optional(),
    min: limitValue.optional(),
    max: limitValue.optional(),
    note: z.string().max(specLimits.note).optional(),
  })
  .strict()
  .superRefine((limit, ctx) => {
    if (limit.min === undefined && limit.max === undefined) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['min'], message: 'needs a lower limit, an upper limit or both' });
    if (limit.min !== undefined && limit.max !== undefined && limit.min > limit.max)
      ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['min'], message: `lower limit ${limit.min} is above the upper limit ${limit.max}` });
  });
export type SpecLimit = z.infer<typeof specLimitSchema>;

/** POST /api/specs. */
export const newSpecSchema = z
  .object({
    name: z.string().trim().min(1, 'must not be blank').max(specLimits.name),
    description: z.string().max(specLimits.description).default(''),
    visibility: visibilitySchema.default('private'),
    limits: z.array(specLimitSchema).max(specLimits.limits),
  })
  .strict();
export type NewSpec = z.infer<typeof newSpecSchema>;

/** PATCH /api/specs/:id: any of the fields; new limits make a new version. */
export const specChangesSchema = newSpecSchema.partial().strict();
export type SpecChanges = z.infer<typeof specChangesSchema>;

/** A specification as the API presents it (its current version). */
export const specSchema = z.object({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  visibility: visibilitySchema,
  /** 1, 2, ...: raised each time the limits change. */
  version: z.number().int().positive(),
  limits: z.array(specLimitSchema),
  owner: personRefSchema,
  createdAt: z.string(),
  updatedAt: z.string(),
  permissions: z.object({ update: z.boolean(), delete: z.boolean() }),
});
export type Spec = z.infer<typeof specSchema>;

export const specListSchema = z.object({
  items: z.array(specSchema),
  total: z.number().int().nonnegative(),
  page: z.number().int().positive(),
  pageSize: z.number().int().positive(),
});
export type SpecList = z.infer<typeof specListSchema>;

/** What POST /api/specs and PATCH answer. */
export const savedSpecSchema = z.object({ id: z.string(), version: z.number().int().positive() });

export const verdictStatuses = ['pass', 'fail', 'not_measured'] as const;
export const verdictStatusSchema = z.enum(verdictStatuses);
export type VerdictStatus = z.infer<typeof verdictStatusSchema>;

/** One limit judged against a run's readout. */
export const verdictSchema = z.object({
  measurement: z.string(),
  /** The test point whose readout was judged (stage id), or null when none had it. */
  testPoint: z.string().nullable(),
  value: z.number().nullable(),
  unit: z.string(),
  min: z.number().nullable(),
  max: z.number().nullable(),
  status: verdictStatusSchema,
  /** Distance to the nearer limit in the readout's unit: positive inside, negative outside; null when not measured. */
  margin: z.number().nullable(),
  /** Why a limit is not measured (the readout's own reason, or that no test point has it). */
  reason: z.string().nullable(),
  note: z.string().nullable(),
});
export type Verdict = z.infer<typeof verdictSchema>;

/** fail if any limit fails; else incomplete if any is not measured; else pass. */
export const overallVerdicts = ['pass', 'fail', 'incomplete'] as const;
export const overallVerdictSchema = z.enum(overallVerdicts);
export type OverallVerdict = z.infer<typeof overallVerdictSchema>;

/** The `verdicts` of GET /api/runs/:id?spec=ID. */
export const runVerdictsSchema = z.object({
  spec: z.object({ id: z.string(), name: z.string(), version: z.number().int() }),
  overall: overallVerdictSchema,
  counts: z.object({ pass: z.number().int(), fail: z.number().int(), not_measured: z.number().int() }),
  /** Failures first, then not measured, then passes (each in the specification's order). */
  limits: z.array(verdictSchema),
});
export type RunVerdicts = z.infer<typeof runVerdictsSchema>;

/** A readout as the verdict needs it, with the test point (stage id) that produced it. */
export interface JudgedReadout {
  testPoint: string;
  name: string;
  value: number | null;
  unit: string;
  reason?: string;
}

/**
 * Judges one value against [min, max]: a value equal to a limit passes; null or a non-finite value
 * is never a pass. Margin is the distance to the nearer limit (positive inside, negative outside).
 */
export function judge(value: number | null, min: number | null, max: number | null): { status: VerdictStatus; margin: number | null } {
  if (value === null || !Number.isFinite(value)) return { status: 'not_measured', margin: null };
  const margins: number[] = [];
  if (min !== null) margins.push(value - min);
  if (max !== null) margins.push(max - value);
  const margin = Math.min(...margins);
  return { status: margin >= 0 ? 'pass' : 'fail', margin };
}

const order: Record<VerdictStatus, number> = { fail: 0, not_measured: 1, pass: 2 };

/** Judges every limit of a specification against a run's readouts (from all its test points). */
export function judgeRun(spec: Pick<Spec, 'id' | 'name' | 'version' | 'limits'>, readouts: readonly JudgedReadout[]): RunVerdicts {
  const verdicts = spec.limits.map((limit): Verdict => {
    const min = limit.min ?? null;
    const max = limit.max ?? null;
    const found = readouts.find((r) => r.name === limit.measurement && (limit.test_point === undefined || r.testPoint === limit.test_point));
    const unit = found?.unit ?? readoutEntry(limit.measurement)?.unit ?? '';
    const base = { measurement: limit.measurement, min, max, note: limit.note ?? null, unit };
    if (!found) {
      const where = limit.test_point === undefined ? 'no test point of this run has it' : `test point "${limit.test_point}" of this run does not have it`;
      return { ...base, testPoint: limit.test_point ?? null, value: null, status: 'not_measured', margin: null, reason: `not measured: ${where}` };
    }
    const { status, margin } = judge(found.value, min, max);
    const reason = status === 'not_measured' ? (found.reason ?? 'the readout has no value') : null;
    return { ...base, testPoint: found.testPoint, value: found.value, status, margin, reason };
  });
  const sorted = verdicts.map((v, i) => ({ v, i })).sort((a, b) => order[a.v.status] - order[b.v.status] || a.i - b.i).map((x) => x.v);
  const counts = { pass: 0, fail: 0, not_measured: 0 };
  for (const v of verdicts) counts[v.status]++;
  const overall: OverallVerdict = counts.fail > 0 ? 'fail' : counts.not_measured > 0 ? 'incomplete' : 'pass';
  return { spec: { id: spec.id, name: spec.name, version: spec.version }, overall, counts, limits: sorted };
}
