import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import {
  captureErrorResponse,
  checkName,
  checkNotes,
  checkTags,
  checkVisibility,
  createSynthesizedCapture,
  getObjectStore,
  presentCapture,
} from '@/lib/server/captures';

const SynthBody = z
  .object({
    name: z.unknown().optional(),
    visibility: z.unknown().optional(),
    notes: z.unknown().optional(),
    tags: z.unknown().optional(),
    spec: z.record(z.unknown(), { required_error: 'is required', invalid_type_error: 'must be an object' }),
  })
  .strict();

/** Synthesizes a capture from a spec, streamed into storage; 201 with the capture (409 if the same bytes exist). */
export const POST = endpoint(async (context) => {
  authorize(context, 'capture.create');
  const user = context.locals.user!;
  const input = await readJson(context.request, SynthBody, 256 * 1024);
  try {
    const capture = await createSynthesizedCapture(getDb(), getObjectStore(), user, {
      name: input.name === undefined ? undefined : checkName(input.name, 'name'),
      visibility: input.visibility === undefined ? undefined : checkVisibility(input.visibility, 'visibility'),
      notes: input.notes === undefined ? undefined : checkNotes(input.notes, 'notes'),
      tags: input.tags === undefined ? undefined : checkTags(input.tags, 'tags'),
      spec: input.spec,
    });
    return json(presentCapture(capture, user), 201, { Location: `/api/captures/${capture.id}` });
  } catch (error) {
    return captureErrorResponse(error, user);
  }
});
