import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { getDb } from '@/lib/server/db';
import { deleteCaptures, findCaptures, getObjectStore, refusal, type CaptureWithOwner } from '@/lib/server/captures';

const BulkDelete = z.object({ ids: z.array(z.string().max(64)).min(1, 'give at least one id').max(100, 'at most 100 ids at once') }).strict();

/** Deletes each capture the user may delete; the others are listed with the reason (not_found, forbidden). */
export const POST = endpoint(async (context) => {
  authorize(context, 'capture.delete');
  const user = context.locals.user!;
  const { ids } = await readJson(context.request, BulkDelete);
  const db = getDb();
  // One query for every capture named and one delete for those allowed, however many ids there are.
  const rows = await findCaptures(db, ids);
  const allowed: CaptureWithOwner[] = [];
  const refused: { id: string; code: string }[] = [];
  for (const id of new Set(ids)) {
    const row = rows.get(id);
    const refusedWith = refusal(user, 'capture.delete', row);
    if (refusedWith) refused.push({ id, code: refusedWith.code });
    else allowed.push(row!);
  }
  await deleteCaptures(db, getObjectStore(), allowed);
  return json({ deleted: allowed.map((row) => row.id), refused });
});
