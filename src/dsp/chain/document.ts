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

/** One stage of a chain; `params` have been checked against (and completed by) the kind's schema. */
export interface ChainStage {
  /** Stable id, unique within the chain; probes and results refer to it. */
  id: string;
  kind: string;
  params: Record<string, unknown>;
  /** Keep and plot this stage's output after a run. */
  probe: boolean;
  /** Pass the input through unchanged (the stage stays in the document). */
  bypass: boolean;
}

/** A validated chain document. */
export interface ChainDocument {
  version: typeof CHAIN_FORMAT_VERSION;
  name: string;
  description?: string;
  stages: ChainStage[];
}

/** The envelope of one stage, without the kind-specific parameter check. */
export const stageEnvelopeSchema = z
  .object({
    id: z
      .string()
      .regex(STAGE_ID_PATTERN, 'must be 1 to 64 letters, digits, "-", "_" or ".", starting with a letter or digit'),
    kind: z.string().min(1),
    params: z.record(z.unknown()).default({}),
    probe: z.boolean().default(false),
    bypass: z.boolean().default(false),
  })
  .strict();

/** The document fields other than the stages. */
export const documentHeaderSchema = z
  .object({
    version: z.unknown(),
    name: z.string().max(200).default(''),
    description: z.string().max(10_000).optional(),
    stages: z.array(z.unknown()).max(MAX_STAGES),
  })
  .strict();
