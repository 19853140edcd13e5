/** Request schemas of the runs endpoints; the first problem becomes a 400 naming the field. */
import { z } from 'zod';
import { runStatuses, type RunStatus } from './rows';

const id = z.string().trim().min(1).max(64);

/** Most captures one request may name (one run each). */
export const MAX_CAPTURES_PER_REQUEST = 100;

/** POST /api/runs: a chain revision (latest when absent) on one capture or several. */
export const SubmitRunsBody = z
  .object({
    chain_id: id,
    revision: z.number().int().min(1).optional(),
    capture_id: id.optional(),
    capture_ids: z.array(id).min(1).max(MAX_CAPTURES_PER_REQUEST).optional(),
  })
  .strict();

const flagParam = z
  .enum(['1', '0', 'true', 'false'])
  .optional()
  .transform((value) => value === '1' || value === 'true');

const statusList = z
  .string()
  .optional()
  .transform((text, context) => {
    const statuses = (text ?? '').split(',').map((s) => s.trim()).filter(Boolean);
    const unknown = statuses.find((status) => !(runStatuses as readonly string[]).includes(status));
    if (unknown !== undefined) {
      context.addIssue({ code: z.ZodIssueCode.custom, message: `"${unknown}" is not a run status (${runStatuses.join(', ')}).` });
      return z.NEVER;
    }
    return statuses as RunStatus[];
  });

/** GET /api/runs query. */
export const ListRunsQuery = z
  .object({
    status: statusList,
    chain_id: id.optional(),
    capture_id: id.optional(),
    mine: flagParam,
    all: flagParam,
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    page_size: z.coerce.number().int().min(1).max(200).default(50),
    /** The list's `nextCursor`: the page after it, by keyset (takes the place of `page`). */
    cursor: z.string().max(200).optional(),
  })
  .strict();

/** GET /api/runs/:id/export query. */
export const ExportQuery = z
  .object({
    format: z.enum(['json', 'csv-spectrum', 'csv-readouts', 'sigmf-meta', 'sigmf-data']),
    probe: z.string().max(64).optional(),
  })
  .strict();

/** GET /api/runs/:id/plot query. */
export const PlotQuery = z
  .object({
    probe: z.string().min(1).max(64),
    kind: z.enum(['spectrum', 'spectrogram', 'trace', 'constellation']),
    width: z.coerce.number().int().min(2).max(10_000).default(1000),
    /** Every bin of a spectrum instead of the reduced preview (for markers that snap to bins). */
    full: flagParam,
  })
  .strict()
  .refine((query) => !query.full || query.kind === 'spectrum', { message: 'full=1 is only for kind=spectrum.', path: ['full'] });

/** GET /api/runs/compare query: 2 to 10 run ids, comma separated. */
export const CompareQuery = z
  .object({
    ids: z
      .string()
      .transform((text) => [...new Set(text.split(',').map((s) => s.trim()).filter(Boolean))])
      .refine((ids) => ids.length >= 2 && ids.length <= 10, 'give 2 to 10 run ids, comma separated'),
    width: z.coerce.number().int().min(2).max(10_000).default(1000),
  })
  .strict();
