/**
 * Request schemas of the chain endpoints. The document itself is taken as any JSON here and
 * validated by the engine's parser, whose errors become 422 `invalid_chain` naming the field.
 */
import { z } from 'zod';
import { MAX_CHAIN_NAME } from './fork';
import { MAX_REVISION_MESSAGE } from './revisions';

/** Largest chain request body (bytes): pasted FIR taps make documents far larger than a form. */
export const chainBodyLimitBytes = 2 * 1024 * 1024;

/** Longest chain description (characters). */
export const MAX_CHAIN_DESCRIPTION = 10_000;

export const chainNameField = z.string().trim().min(1).max(MAX_CHAIN_NAME);
export const chainDescriptionField = z.string().max(MAX_CHAIN_DESCRIPTION);
export const visibilityField = z.enum(['private', 'team'], { errorMap: () => ({ message: 'Use private or team.' }) });
export const revisionMessageField = z.string().trim().max(MAX_REVISION_MESSAGE);
const revisionField = z.number().int().min(1).max(999_999_999);

/** Any JSON value, but present: a missing document is a 400 `required`, a wrong one a 422 from the engine. */
const documentField = z.unknown().superRefine((value, ctx) => {
  if (value === undefined) ctx.addIssue({ code: z.ZodIssueCode.invalid_type, expected: 'object', received: 'undefined' });
});

/** `POST /api/chains` (create or import): `name` falls back to the document's own name. */
export const CreateChainBody = z
  .object({
    name: chainNameField.optional(),
    description: chainDescriptionField.optional(),
    visibility: visibilityField.default('private'),
    document: documentField,
    message: revisionMessageField.optional(),
  })
  .strict();

/** `PATCH /api/chains/:id`. */
export const UpdateChainBody = z
  .object({ name: chainNameField.optional(), description: chainDescriptionField.optional(), visibility: visibilityField.optional() })
  .strict()
  .refine((changes) => Object.keys(changes).length > 0, { message: 'Give at least one of name, description, visibility.' });

/** `POST /api/chains/:id/revisions`. */
export const AddRevisionBody = z.object({ document: documentField, message: revisionMessageField.default('') }).strict();

/** `POST /api/chains/:id/restore`. */
export const RestoreBody = z.object({ revision: revisionField, message: revisionMessageField.optional() }).strict();

/** `POST /api/chains/:id/fork`. */
export const ForkBody = z.object({ name: chainNameField.optional(), revision: revisionField.optional() }).strict();

/** `GET /api/chains` query. */
export const ListQuery = z
  .object({
    q: z.string().max(200).optional(),
    owner: z.union([z.literal('me'), z.string().uuid('must be a user id or "me"')]).optional(),
    page: z.coerce.number().int().min(1).max(1_000_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(20),
    sort: z.enum(['name', 'updatedAt', 'createdAt', 'latestRevision']).default('updatedAt'),
    order: z.enum(['asc', 'desc']).default('desc'),
  })
  .strict();
