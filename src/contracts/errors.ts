/**
 * The error body every Quadrille endpoint answers with, `{ error: { code, message, field } }`,
 * and the facts an error may carry beside its sentence. A fact travels as a field of its own
 * (`stageIndex`, `stageId`, `sampleIndex`), so no caller ever reads it back out of the message.
 */
import { z } from 'zod';

/** Facts an error states as fields; each is present only when it applies. */
export const apiErrorFactsSchema = z.object({
  /** Position (0-based) of the chain stage at fault. */
  stageIndex: z.number().int().nonnegative().optional(),
  /** Id of the chain stage at fault. */
  stageId: z.string().optional(),
  /** Index (0-based) of the sample at fault, counted from the start of the stream read. */
  sampleIndex: z.number().int().nonnegative().optional(),
});
export type ApiErrorFacts = z.infer<typeof apiErrorFactsSchema>;

/** One API error: a stable machine-readable code, a sentence for people, the input field at fault (or null). */
export const apiErrorSchema = z
  .object({
    code: z.string().min(1),
    message: z.string(),
    field: z.string().nullable(),
  })
  .merge(apiErrorFactsSchema);
export type ApiErrorInfo = z.infer<typeof apiErrorSchema>;

/** The body of every 4xx/5xx JSON answer. Some answers add siblings (a 409 duplicate adds `capture`). */
export const apiErrorBodySchema = z.object({ error: apiErrorSchema }).passthrough();
export type ApiErrorBody = z.infer<typeof apiErrorBodySchema>;

/** The API error inside a parsed answer body, or null when the body is not an API error. */
export function apiErrorOf(body: unknown): ApiErrorInfo | null {
  const parsed = apiErrorBodySchema.safeParse(body);
  return parsed.success ? parsed.data.error : null;
}
