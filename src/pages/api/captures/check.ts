import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { readJson } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { unprocessable } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { assertFits, captureAllowance } from '@/lib/server/quota';
import { bytesPerSampleOf, completeDescription, jsonFieldNames, parseStatedFields, presentCapture, type CaptureRow } from '@/lib/server/captures';
import { findCapture } from '@/lib/server/captures';

const Check = z
  .object({
    name: z.unknown(),
    datatype: z.unknown(),
    sampleRate: z.unknown(),
    centerFrequency: z.unknown().optional(),
    layout: z.unknown().optional(),
    visibility: z.unknown().optional(),
    tags: z.unknown().optional(),
    notes: z.unknown().optional(),
    byteSize: z.number({ required_error: 'is required', invalid_type_error: 'must be a number of bytes' }).int('must be a whole number of bytes').min(1, 'must be at least 1 byte'),
    sha256: z.string().regex(/^[0-9a-fA-F]{64}$/, 'must be 64 hexadecimal digits').optional(),
  })
  .strict();

/**
 * Checks an upload before its bytes travel (same rules as the upload itself: fields, whole
 * samples, quota); with the sha256 of a capture the user already has, offers that capture.
 */
export const POST = endpoint(async (context) => {
  authorize(context, 'capture.create');
  const user = context.locals.user!;
  const input = await readJson(context.request, Check);
  const stated = parseStatedFields(input, jsonFieldNames);
  const description = completeDescription(stated, {}, jsonFieldNames);
  const bytesPerSample = bytesPerSampleOf(description.datatype, description.layout);
  if (input.byteSize % bytesPerSample !== 0) {
    throw unprocessable(
      'invalid_field',
      `byteSize: ${input.byteSize} bytes is not a whole number of ${bytesPerSample}-byte samples (${description.datatype.name}, ${description.layout}).`,
      'byteSize',
    );
  }
  const db = getDb();
  if (input.sha256) {
    const existing = await db<CaptureRow>('captures').where({ owner_id: user.id, sha256: input.sha256.toLowerCase() }).first('id');
    if (existing) return json({ ok: true, duplicate: presentCapture((await findCapture(db, existing.id))!, user) });
  }
  assertFits(await captureAllowance(db, user.id), input.byteSize, 'byteSize');
  return json({ ok: true });
});
