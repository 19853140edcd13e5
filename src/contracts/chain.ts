/**
 * The chain contract: the chain document (its schema is the engine's, in src/dsp/chain, re-exported
 * here so it is declared once), a stored revision's document as a branded type, and a chain as the
 * API presents it (list item, detail with its latest revision, revision with or without document).
 */
import { z } from 'zod';
import { CHAIN_FORMAT_VERSION, MAX_STAGES, STAGE_ID_PATTERN, chainOutlineSchema, stageEnvelopeSchema, type ChainDocument, type ChainStage } from '../dsp/chain/document';
import { chainDocumentSchema } from '../dsp/chain/parse';
import { personRefSchema, visibilitySchema } from './capture';

export { CHAIN_FORMAT_VERSION, MAX_STAGES, STAGE_ID_PATTERN, chainOutlineSchema, chainDocumentSchema, stageEnvelopeSchema as chainStageSchema };
export type { ChainDocument, ChainStage };

/**
 * A chain document as stored in a revision: validated in full and made canonical once, when it was
 * saved. The brand keeps a document read from anywhere else from passing for one.
 */
export const storedChainDocumentSchema = chainOutlineSchema.brand<'StoredChainDocument'>();
export type StoredChainDocument = z.output<typeof storedChainDocumentSchema>;

/** A stored revision's text that is not a chain document (edited outside the application, damaged). */
export class StoredChainDocumentError extends Error {
  override name = 'StoredChainDocumentError';
  constructor(
    message: string,
    /** The document field at fault (dot path), or null for the text as a whole. */
    readonly field: string | null,
  ) {
    super(message);
  }
}

/**
 * The one reader of a stored revision's JSON text. The full validation ran when it was saved, so
 * this checks only the outline (version, stage envelopes), which catches text changed since.
 */
export function readStoredChainDocument(json: string): StoredChainDocument {
  let value: unknown;
  try {
    value = JSON.parse(json);
  } catch (error) {
    throw new StoredChainDocumentError(`stored chain document: not JSON (${(error as Error).message})`, null);
  }
  return storedChainDocumentOf(value);
}

/** A stored revision's document already parsed from JSON (an API answer's `document`), checked as readStoredChainDocument does. */
export function storedChainDocumentOf(value: unknown): StoredChainDocument {
  const result = storedChainDocumentSchema.safeParse(value);
  if (result.success) return result.data;
  const issue = result.error.issues[0]!;
  const field = issue.path.map((part) => (typeof part === 'number' ? `[${part}]` : `.${part}`)).join('').replace(/^\./, '');
  throw new StoredChainDocumentError(`stored chain document: ${field || 'document'}: ${issue.message}`, field || null);
}

/** What the viewer may do with a chain. */
export const chainPermissionsSchema = z.object({ update: z.boolean(), delete: z.boolean(), fork: z.boolean(), run: z.boolean() });
export type ChainPermissions = z.infer<typeof chainPermissionsSchema>;

/** A chain as the API presents it (a list item, and the head of the detail). Times are ISO-8601 UTC. */
export const chainSchema = z.object({
  id: z.string(),
  name: z.string(),
  /** Empty when there is none (never null). */
  description: z.string(),
  owner: personRefSchema,
  visibility: visibilitySchema,
  /** Counts from 1. */
  latestRevision: z.number().int().positive(),
  createdAt: z.string(),
  updatedAt: z.string(),
  forkedFrom: z.object({ chainId: z.string(), revision: z.number().int().positive() }).nullable(),
  permissions: chainPermissionsSchema,
});
export type Chain = z.infer<typeof chainSchema>;

/** What the owner may change of a chain itself (a PATCH body); documents change only by new revisions. */
export const chainChangesSchema = chainSchema.pick({ name: true, description: true, visibility: true }).partial();
export type ChainChanges = z.infer<typeof chainChangesSchema>;

/** A revision in the history list (without its document). */
export const revisionSummarySchema = z.object({
  chainId: z.string(),
  revision: z.number().int().positive(),
  message: z.string(),
  author: personRefSchema,
  createdAt: z.string(),
  /** SHA-256 (hex) of the canonical chain JSON. */
  hash: z.string(),
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** A revision with its chain document. */
export const revisionSchema = revisionSummarySchema.extend({ document: chainOutlineSchema });
export type RevisionWithDocument = z.infer<typeof revisionSchema>;

/** A chain with its latest revision, as `GET /api/chains/:id` answers. */
export const chainWithRevisionSchema = chainSchema.extend({ revision: revisionSchema });
export type ChainWithRevision = z.infer<typeof chainWithRevisionSchema>;

/** One page of the chains list. */
export const chainListSchema = z.object({
  items: z.array(chainSchema),
  total: z.number().int().nonnegative(),
  page: z.number().int().positive(),
  pageSize: z.number().int().positive(),
});
export type ChainList = z.infer<typeof chainListSchema>;
