/**
 * Changing and removing captures. Only descriptive fields change; the samples, datatype and rate
 * are fixed once stored (a different interpretation is a different capture).
 */
import type { Knex } from 'knex';
import { FormatError, buildSigmfMeta, parseSigmfMeta, SIGMF_VERSION } from '@/dsp/formats';
import type { ObjectStore } from '../storage';
import { badRequest, unprocessable } from '../api/errors';
import type { CaptureChanges } from '@/contracts/capture';
import { findCapture, type CaptureRow, type CaptureWithOwner } from './rows';

/** Fields PATCH may change (the contract's), already checked one by one. */
export type { CaptureChanges };

/**
 * Checks annotations as SigMF defines them and against the capture's length; answers them in
 * canonical form. Errors name the field as `annotations[i].core:...`.
 */
export function checkAnnotations(annotations: unknown[], capture: Pick<CaptureRow, 'datatype' | 'sample_count'>): Record<string, unknown>[] {
  let built: Record<string, unknown>;
  try {
    const meta = parseSigmfMeta({ global: { 'core:datatype': capture.datatype, 'core:version': SIGMF_VERSION }, captures: [], annotations });
    built = buildSigmfMeta(meta);
  } catch (error) {
    if (error instanceof FormatError) throw badRequest('invalid_field', error.message, error.field ?? 'annotations');
    throw error;
  }
  const out = built.annotations as Record<string, unknown>[];
  const samples = Number(capture.sample_count);
  out.forEach((annotation, index) => {
    const start = annotation['core:sample_start'] as number;
    const count = (annotation['core:sample_count'] as number | undefined) ?? 0;
    if (start >= samples || start + count > samples) {
      const field = `annotations[${index}].${start >= samples ? 'core:sample_start' : 'core:sample_count'}`;
      throw unprocessable('invalid_field', `${field}: the annotation reaches past the capture's ${samples} samples.`, field);
    }
  });
  return out;
}

/** Applies `changes` to the capture `row` (access already checked); answers the updated capture. */
export async function updateCapture(db: Knex, row: CaptureWithOwner, changes: CaptureChanges): Promise<CaptureWithOwner> {
  const update: Partial<CaptureRow> = { updated_at: new Date().toISOString() };
  if (changes.name !== undefined) update.name = changes.name;
  if (changes.notes !== undefined) update.notes = changes.notes;
  if (changes.tags !== undefined) update.tags = JSON.stringify(changes.tags);
  if (changes.visibility !== undefined) update.visibility = changes.visibility;
  if (changes.centerFrequency !== undefined) update.center_frequency = changes.centerFrequency;
  if (changes.annotations !== undefined) update.annotations = JSON.stringify(checkAnnotations(changes.annotations, row));
  await db('captures').where({ id: row.id }).update(update);
  return (await findCapture(db, row.id))!;
}

/** Removes the row, then the samples (a failed object delete leaves stray bytes, never a row without bytes). */
export async function deleteCapture(db: Knex, store: ObjectStore, row: Pick<CaptureRow, 'id' | 'storage_key'>): Promise<void> {
  await deleteCaptures(db, store, [row]);
}

/** Deletes several captures in one statement, then their objects (a failure to remove one is logged). */
export async function deleteCaptures(db: Knex, store: ObjectStore, rows: Pick<CaptureRow, 'id' | 'storage_key'>[]): Promise<void> {
  if (rows.length === 0) return;
  await db('captures').whereIn('id', rows.map((row) => row.id)).delete();
  for (const row of rows) {
    try {
      await store.delete(row.storage_key);
    } catch (error) {
      console.error(`Capture ${row.id} is deleted but its object ${row.storage_key} could not be removed:`, error);
    }
  }
}
