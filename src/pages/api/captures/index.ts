import { z } from 'zod';
import { endpoint, authorize } from '@/lib/server/api/endpoint';
import { parseWith } from '@/lib/server/api/parse';
import { json } from '@/lib/server/api/respond';
import { badRequest, unauthenticated } from '@/lib/server/api/errors';
import { getDb } from '@/lib/server/db';
import { storageUsage } from '@/lib/server/quota';
import {
  captureErrorResponse,
  createCapture,
  getObjectStore,
  listCaptures,
  parseStatedFields,
  presentCapture,
  queryFieldNames,
  requestBody,
  sortKeys,
  uploadFormats,
  type UploadFormat,
} from '@/lib/server/captures';

const ListQuery = z
  .object({
    q: z.string().max(200).optional(),
    owner: z.string().max(64).optional(),
    tag: z.string().max(40).optional(),
    layout: z.enum(['complex', 'real', 'real-pair']).optional(),
    datatype: z.string().max(16).optional(),
    minRate: z.coerce.number().finite().min(0).optional(),
    maxRate: z.coerce.number().finite().min(0).optional(),
    sort: z.enum(Object.keys(sortKeys) as [keyof typeof sortKeys]).default('createdAt'),
    order: z.enum(['asc', 'desc']).default('desc'),
    page: z.coerce.number().int().min(1).default(1),
    pageSize: z.coerce.number().int().min(1).max(100).default(25),
  })
  .strict();

/** Captures the user can see, filtered, sorted and paged, with storage used against the quota. */
export const GET = endpoint(async (context) => {
  authorize(context, 'capture.read');
  const user = context.locals.user!;
  const given = Object.fromEntries([...context.url.searchParams].filter(([, value]) => value !== ''));
  const query = parseWith(ListQuery, given);
  const db = getDb();
  const [{ items, total }, usage] = await Promise.all([listCaptures(db, user, query), storageUsage(db, user.id)]);
  return json({ items: items.map((row) => presentCapture(row, user)), total, page: query.page, pageSize: query.pageSize, usage });
});

const uploadParameters = ['name', 'datatype', 'sample_rate', 'center_frequency', 'layout', 'visibility', 'tags', 'notes', 'format'];

/**
 * One-request upload: the body is the raw samples (format=raw, default), a WAV file or a `.sigmf`
 * archive, streamed into storage. 201 with the capture; 409 duplicate with the existing one.
 */
export const POST = endpoint(async (context) => {
  authorize(context, 'capture.create');
  const user = context.locals.user;
  if (!user) throw unauthenticated();
  const params = context.url.searchParams;
  const unknown = [...params.keys()].find((key) => !uploadParameters.includes(key));
  const body = requestBody(context.request);
  try {
    if (unknown) throw badRequest('unknown_field', `Unknown parameter ${unknown}.`, unknown);
    const format = params.get('format') || 'raw';
    if (!(uploadFormats as readonly string[]).includes(format)) throw badRequest('invalid_field', 'format must be raw, wav or sigmf.', 'format');
    const get = (key: string) => params.get(key) ?? undefined;
    const stated = parseStatedFields(
      {
        name: get('name'),
        datatype: get('datatype'),
        layout: get('layout'),
        sampleRate: get('sample_rate'),
        centerFrequency: get('center_frequency'),
        visibility: get('visibility'),
        tags: get('tags'),
        notes: get('notes'),
      },
      queryFieldNames,
    );
    const length = context.request.headers.get('content-length');
    const capture = await createCapture(getDb(), getObjectStore(), {
      owner: user,
      stated,
      names: queryFieldNames,
      format: format as UploadFormat,
      asComplex: format === 'wav' && stated.layout === 'complex',
      source: body.source,
      announcedBytes: length !== null && /^\d+$/.test(length) ? Number(length) : null,
      signal: context.request.signal,
      origin: 'uploaded',
    });
    return json(presentCapture(capture, user), 201, { Location: `/api/captures/${capture.id}` });
  } catch (error) {
    body.abandon();
    return captureErrorResponse(error, user);
  }
});
