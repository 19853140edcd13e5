import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json, noContent } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import {
  checkCenterFrequency,
  checkName,
  checkNotes,
  checkTags,
  checkVisibility,
  deleteCapture,
  getObjectStore,
  loadCaptureFor,
  presentCapture,
  updateCapture,
  type CaptureChanges,
} from '@/lib/server/captures';

/** One capture. */
export const GET = endpoint(async (context) => {
  authorize(context, 'capture.read');
  const user = context.locals.user!;
  const row = await loadCaptureFor(getDb(), user, context.params.id ?? '', 'capture.read');
  return json(presentCapture(row, user));
});

const Changes = z
  .object({
    name: z.unknown().optional(),
    notes: z.unknown().optional(),
    tags: z.unknown().optional(),
    visibility: z.unknown().optional(),
    centerFrequency: z.unknown().optional(),
    annotations: z.array(z.unknown()).max(10_000, 'at most 10000 annotations').optional(),
  })
  .strict()
  .refine((changes) => Object.keys(changes).length > 0, { message: 'Give at least one of name, notes, tags, visibility, centerFrequency, annotations.' });

/** Changes the descriptive fields of a capture (owner or admin). */
export const PATCH = endpoint(async (context) => {
  authorize(context, 'capture.update');
  const user = context.locals.user!;
  const db = getDb();
  const row = await loadCaptureFor(db, user, context.params.id ?? '', 'capture.update');
  const input = await readJson(context.request, Changes, 4 * 1024 * 1024);
  const changes: CaptureChanges = {};
  if ('name' in input) changes.name = checkName(input.name, 'name');
  if ('notes' in input) changes.notes = checkNotes(input.notes, 'notes');
  if ('tags' in input) changes.tags = checkTags(input.tags, 'tags');
  if ('visibility' in input) changes.visibility = checkVisibility(input.visibility, 'visibility');
  if ('centerFrequency' in input) changes.centerFrequency = checkCenterFrequency(input.centerFrequency, 'centerFrequency');
  if (input.annotations !== undefined) changes.annotations = input.annotations;
  return json(presentCapture(await updateCapture(db, row, changes), user));
});

/** Deletes a capture and its samples (owner or admin). */
export const DELETE = endpoint(async (context) => {
  authorize(context, 'capture.delete');
  const user = context.locals.user!;
  const db = getDb();
  const row = await loadCaptureFor(db, user, context.params.id ?? '', 'capture.delete');
  await deleteCapture(db, getObjectStore(), row);
  return noContent();
});
