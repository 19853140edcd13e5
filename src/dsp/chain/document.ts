/**
 * The chain document (format version 1): an ordered list of stages, each with a stable id, a kind,
 * the kind's parameters and probe / bypass flags.
 *
 *   { "version": 1, "name": "Beacon down-conversion", "description": "...",
 *     "stages": [ { "id": "s1", "kind": "mix", "params": { "frequency": -1250000 },
 *                   "probe": false, "bypass": false } ] }
 */
import { z } from 'zod';

/** The chain format version this engine reads and writes. */
export const CHAIN_FORMAT_VERSION = 1;

/** Most stages a chain may hold. */
export const MAX_STAGES = 64;

/** Stage ids: 1 to 64 characters, letters, digits, '-', '_' or '.', starting with a letter or digit. */
export const STAGE_ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9_.-]{0,63}$/;

/**
 * The envelope of one stage, without the kind-specific parameter check. Its output is a stage of a
 * chain document; `params` are checked against (and completed by) the kind's schema in parse.ts.
 */
export const stageEnvelopeSchema = z
  .object({
    /** Stable id, unique within the chain; probes and results refer to it. */
    id: z
      .string()
      .regex(STAGE_ID_PATTERN, 'must be 1 to 64 letters, digits, "-", "_" or ".", starting with a letter or digit'),
    kind: z.string().min(1),
    params: z.record(z.unknown()).default({}),
    /** Keep and plot this stage's output after a run. */
    probe: z.boolean().default(false),
    /** Pass the input through unchanged (the stage stays in the document). */
    bypass: z.boolean().default(false),
  })
  .strict();

/** One stage of a chain. */
export type ChainStage = z.output<typeof stageEnvelopeSchema>;

/**
 * The outline of a chain document: version, name, description and stage envelopes. The full
 * validation (unique ids, known kinds, each kind's parameters) is parseChainDocument.
 */
export const chainOutlineSchema = z
  .object({
    version: z.literal(CHAIN_FORMAT_VERSION),
    name: z.string().max(200).default(''),
    description: z.string().max(10_000).optional(),
    stages: z.array(stageEnvelopeSchema).max(MAX_STAGES),
  })
  .strict();

/** A chain document (validated when it comes out of parseChainDocument). */
export type ChainDocument = z.output<typeof chainOutlineSchema>;

/** The document fields other than the stages (version and stages are checked one by one). */
export const documentHeaderSchema = chainOutlineSchema.extend({
  version: z.unknown(),
  stages: z.array(z.unknown()).max(MAX_STAGES),
});
