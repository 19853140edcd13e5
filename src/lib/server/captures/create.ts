/**
 * The one command that turns a stream of bytes into a capture, used by the one-request upload,
 * the resumable upload's completion, the synthesizer and the demo seed:
 *
 *  1. check what the request states before a byte is read (and the announced size against the
 *     quota and the sample size, when known);
 *  2. read the format's header, complete and check the description;
 *  3. stream the samples into the object store under a fresh key, hashing on the way, with the
 *     quota as the store's byte limit (an oversized upload stops at the limit) and the
 *     whole-sample / finite-value check in the stream (a bad body fails the put, nothing stays);
 *  4. in one transaction: refuse a duplicate (same sha256 for this owner) or a quota that
 *     concurrent uploads used up meanwhile, else insert the row;
 *  5. on any failure after the put, delete the new object.
 */
import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import type { ObjectStore } from '../storage';
import { captureAllowance, assertFits, quotaError, quotaOf, storageUsed, type Allowance } from '../quota';
import { unprocessable } from '../api/errors';
import { completeDescription, type CaptureDescription, type FieldNames, type StatedFields } from './metadata';
import { bytesPerSampleOf, openUpload, partialSampleError, wholeSamples, type ChunkSource, type UploadFormat } from './ingest';
import { DuplicateCaptureError, ingestError } from './errors';
import { findCapture, type CaptureRow, type CaptureSource, type CaptureWithOwner } from './rows';
import { captureObjectKey } from './store';

/** Everything the command needs to take in one capture. */
export interface CaptureIntake {
  owner: Actor;
  /** Fields the request states (already checked one by one). */
  stated: StatedFields;
  /** Fields a description sent beside the bytes states (a `.sigmf-meta` with a resumable upload). */
  described?: StatedFields;
  /** How the caller spells the fields, for error messages. */
  names: FieldNames;
  format: UploadFormat;
  /** WAV only: two channels are I and Q. */
  asComplex?: boolean;
  /** The body. */
  source: ChunkSource;
  /** Body length in bytes if announced (Content-Length, Upload-Length), else null. */
  announcedBytes?: number | null;
  /** Cancels the put (client gone). */
  signal?: AbortSignal;
  origin: CaptureSource;
  /** Synthesizer spec (defaults filled in) of a synthesized capture. */
  synthSpec?: unknown;
}

/** Takes in a capture; resolves to the new row or throws an ApiError (DuplicateCaptureError for 409). */
export async function createCapture(db: Knex, store: ObjectStore, intake: CaptureIntake): Promise<CaptureWithOwner> {
  let allowance: Allowance | null = null;
  try {
    allowance = await captureAllowance(db, intake.owner.id);
    if (intake.format === 'raw') checkAnnouncedRaw(intake, allowance);
    const opened = await openUpload(intake.format, intake.source, { asComplex: intake.asComplex });
    const description = completeDescription(intake.stated, { ...intake.described, ...opened.file }, intake.names);
    const bytesPerSample = bytesPerSampleOf(description.datatype, description.layout);
    if (opened.dataBytes !== null) {
      if (opened.dataBytes === 0) throw unprocessable('invalid_body', 'body: the file holds no samples.', 'body');
      if (opened.dataBytes % bytesPerSample !== 0) throw partialSampleError(opened.dataBytes, bytesPerSample, description.datatype, description.layout);
      assertFits(allowance, opened.dataBytes);
    }
    const id = randomUUID();
    const key = captureObjectKey(id);
    // Checked on the way; each store reads ahead of its own writes (see LocalFileStore.put, S3Store.put).
    const samples = wholeSamples(opened.data, description.datatype, description.layout);
    const stored = await store.put(key, samples, {
      maxBytes: allowance.maxBytes,
      expectedBytes: opened.dataBytes ?? undefined,
      signal: intake.signal,
      contentType: 'application/octet-stream',
    });
    try {
      await opened.finish();
      return await insertCapture(db, {
        id,
        owner: intake.owner,
        description,
        bytes: stored.bytes,
        sampleCount: stored.bytes / bytesPerSample,
        sha256: stored.sha256,
        key,
        origin: intake.origin,
        synthSpec: intake.synthSpec,
      });
    } catch (error) {
      await store.delete(key);
      throw error;
    }
  } catch (error) {
    throw ingestError(error, allowance);
  }
}

/** Raw bodies are described wholly by the request, so a wrong announced size fails before reading. */
function checkAnnouncedRaw(intake: CaptureIntake, allowance: Allowance): void {
  const description = completeDescription(intake.stated, intake.described ?? {}, intake.names);
  const announced = intake.announcedBytes;
  if (announced === null || announced === undefined) return;
  if (announced === 0) throw unprocessable('invalid_body', 'body: the upload holds no sample bytes.', 'body');
  const bytesPerSample = bytesPerSampleOf(description.datatype, description.layout);
  if (announced % bytesPerSample !== 0) throw partialSampleError(announced, bytesPerSample, description.datatype, description.layout);
  assertFits(allowance, announced);
}

interface NewCapture {
  id: string;
  owner: Actor;
  description: CaptureDescription;
  bytes: number;
  sampleCount: number;
  sha256: string;
  key: string;
  origin: CaptureSource;
  synthSpec?: unknown;
}

async function existingDuplicate(db: Knex, ownerId: string, sha256: string): Promise<CaptureWithOwner | undefined> {
  const row = await db<CaptureRow>('captures').where({ owner_id: ownerId, sha256 }).first('id');
  return row ? findCapture(db, row.id) : undefined;
}

async function insertCapture(db: Knex, capture: NewCapture): Promise<CaptureWithOwner> {
  const { description: d } = capture;
  const now = new Date().toISOString();
  const row: CaptureRow = {
    id: capture.id,
    owner_id: capture.owner.id,
    name: d.name,
    visibility: d.visibility,
    sample_rate: d.sampleRate,
    center_frequency: d.centerFrequency,
    datatype: d.datatype.name,
    layout: d.layout,
    sample_count: capture.sampleCount,
    byte_size: capture.bytes,
    sha256: capture.sha256,
    storage_key: capture.key,
    source: capture.origin,
    synth_spec: capture.synthSpec === undefined ? null : JSON.stringify(capture.synthSpec),
    notes: d.notes,
    tags: JSON.stringify(d.tags),
    annotations: JSON.stringify(d.annotations),
    created_at: now,
    updated_at: now,
  };
  try {
    await db.transaction(async (trx) => {
      const duplicate = await trx('captures').where({ owner_id: row.owner_id, sha256: row.sha256 }).first('id');
      if (duplicate) throw new DuplicateMarker();
      // Uploads running side by side each passed the quota alone; the last to finish is refused.
      const [quota, used] = await Promise.all([quotaOf(trx, row.owner_id), storageUsed(trx, row.owner_id)]);
      if (used.storedBytes + row.byte_size > quota.storageBytes) {
        throw quotaError({ maxBytes: Math.max(0, quota.storageBytes - used.storedBytes), limitedBy: 'storage', quota, storedBytes: used.storedBytes }, row.byte_size);
      }
      await trx('captures').insert(row);
    });
  } catch (error) {
    if (error instanceof DuplicateMarker || isUniqueViolation(error)) {
      const existing = await existingDuplicate(db, row.owner_id, row.sha256);
      if (existing) throw new DuplicateCaptureError(existing);
    }
    throw error;
  }
  return (await findCapture(db, row.id))!;
}

class DuplicateMarker extends Error {}

function isUniqueViolation(error: unknown): boolean {
  return typeof error === 'object' && error !== null && String((error as { code?: unknown }).code).startsWith('SQLITE_CONSTRAINT');
}
