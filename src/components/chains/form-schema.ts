/**
 * The zod schema a stage form validates with (through react-hook-form's zod resolver): it reads
 * the typed text into parameters, then checks them against the stage kind's own schema, so the
 * form shows exactly the problems the engine would report, worded the same way.
 */
import { z } from 'zod';
import type { StageDefinition } from '@/dsp/types';
import { describeZodIssue, fieldPath } from '@/dsp/chain/messages';
import type { FieldSpec } from './field-model';
import { formValuesToParams, type FormValues } from './form-values';

/**
 * Schema over form values whose output is the stage's checked parameters. Problems are reported on
 * the top-level field they concern (a bad pasted tap on `coefficients`, naming the entry).
 */
export function stageFormSchema(definition: StageDefinition<any>, fields: FieldSpec[], base: () => Record<string, unknown>) {
  return z.custom<FormValues>((v) => typeof v === 'object' && v !== null).transform((values, ctx) => {
    const reading = formValuesToParams(fields, values, base());
    for (const [name, message] of Object.entries(reading.errors)) ctx.addIssue({ code: z.ZodIssueCode.custom, path: [name], message });
    const parsed = definition.schema.safeParse(reading.params);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const name = String(issue.path[0] ?? '');
        if (reading.errors[name]) continue;
        const rest = issue.path.length > 1 ? `${fieldPath(issue.path.slice(1).map((p) => (typeof p === 'number' ? p : String(p))))}: ` : '';
        const entry = /^\[(\d+)\]: $/.exec(rest);
        const where = entry ? `entry ${Number(entry[1]) + 1}: ` : rest;
        ctx.addIssue({ code: z.ZodIssueCode.custom, path: [name], message: where + describeZodIssue(issue, definition.fields[name]?.unit) });
      }
    }
    if (Object.keys(reading.errors).length > 0 || !parsed.success) return z.NEVER;
    return parsed.data as Record<string, unknown>;
  });
}
