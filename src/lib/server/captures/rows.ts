/**
 * The captures table as rows (the storage mapping of the capture contract in
 * src/contracts/capture.ts, whose field types it borrows), and the one query every read starts
 * from (capture + owner name).
 */
import type { Knex } from 'knex';
import type { Capture, CaptureFormat, CaptureSource, RunJobCapture } from '@/contracts/capture';

export type { CaptureSource };

export interface CaptureRow {
  id: string;
  owner_id: string;
  name: Capture['name'];
  visibility: Capture['visibility'];
  /** Hz. */
  sample_rate: Capture['sampleRate'];
  /** Hz, or null. */
  center_frequency: Capture['centerFrequency'];
  datatype: Capture['datatype'];
  layout: Capture['layout'];
  sample_count: number;
  byte_size: number;
  sha256: Capture['sha256'];
  storage_key: string;
  source: CaptureSource;
  /** JSON text of the synthesizer spec (defaults filled in), or null. */
  synth_spec: string | null;
  notes: string;
  /** JSON text: string[]. */
  tags: string;
  /** JSON text: SigMF annotation objects. */
  annotations: string;
  created_at: string;
  updated_at: string;
}

/** A row joined with its owner's display name. */
export interface CaptureWithOwner extends CaptureRow {
  owner_name: string;
}

/** Captures joined with their owners' names; add where/order clauses to it. */
export function captureQuery(db: Knex): Knex.QueryBuilder<CaptureWithOwner, CaptureWithOwner[]> {
  return db<CaptureWithOwner>('captures')
    .join('users', 'users.id', 'captures.owner_id')
    .select('captures.*', 'users.name as owner_name');
}

/** One capture with its owner's name, or undefined. */
export async function findCapture(db: Knex, id: string): Promise<CaptureWithOwner | undefined> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return undefined;
  return (await captureQuery(db).where('captures.id', id).first()) as CaptureWithOwner | undefined;
}

/** The fields of a row that say what stream it feeds into a chain (see streamFormatOf). */
export function captureFormatOf(row: CaptureRow): CaptureFormat {
  return { sampleRate: row.sample_rate, layout: row.layout, centerFrequency: row.center_frequency };
}

/** What a run worker is told about the capture of this row. */
export function runJobCaptureOf(row: CaptureRow): RunJobCapture {
  return {
    id: row.id,
    name: row.name,
    storageKey: row.storage_key,
    datatype: row.datatype,
    ...captureFormatOf(row),
    sampleCount: Number(row.sample_count),
  };
}

/** Several captures with their owners' names in one query, by id (ids that match nothing are absent). */
export async function findCaptures(db: Knex, ids: string[]): Promise<Map<string, CaptureWithOwner>> {
  const wellFormed = [...new Set(ids)].filter((id) => /^[0-9a-f-]{36}$/i.test(id));
  if (wellFormed.length === 0) return new Map();
  const rows = (await captureQuery(db).whereIn('captures.id', wellFormed)) as CaptureWithOwner[];
  return new Map(rows.map((row) => [row.id, row]));
}

/** Parses a JSON text column, falling back to `fallback` if it is not valid JSON. */
export function parseJsonColumn<T>(text: string | null, fallback: T): T {
  if (text === null) return fallback;
  try {
    return JSON.parse(text) as T;
  } catch {
    return fallback;
  }
}
