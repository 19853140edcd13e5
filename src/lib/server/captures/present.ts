/**
 * Shapes captures for API answers (the contract the capture pages build on): never the row, so
 * storage keys and new columns cannot leak.
 */
import { can, type Actor } from '@/lib/permissions';
import type { SampleType } from '@/dsp/types';
import { parseDatatype } from '@/dsp/formats';
import type { Visibility } from './metadata';
import { parseJsonColumn, type CaptureSource, type CaptureWithOwner } from './rows';
import { bytesPerSampleOf } from './ingest/whole-samples';

export interface PresentedCapture {
  id: string;
  name: string;
  owner: { id: string; name: string };
  visibility: Visibility;
  /** Samples per second (Hz). */
  sampleRate: number;
  /** Hz, or null when unknown. */
  centerFrequency: number | null;
  /** SigMF datatype string. */
  datatype: string;
  layout: SampleType;
  sampleCount: number;
  /** Bytes stored. */
  byteSize: number;
  /** Bytes per sample, every channel. */
  bytesPerSample: number;
  /** sampleCount / sampleRate (s). */
  durationSeconds: number;
  sha256: string;
  source: CaptureSource;
  synthSpec: unknown | null;
  notes: string;
  tags: string[];
  /** SigMF annotation objects. */
  annotations: Record<string, unknown>[];
  createdAt: string;
  permissions: { update: boolean; delete: boolean };
}

/** The capture as `viewer` sees it, with what `viewer` may do to it. */
export function presentCapture(row: CaptureWithOwner, viewer: Actor): PresentedCapture {
  const resource = { ownerId: row.owner_id, visibility: row.visibility };
  const sampleCount = Number(row.sample_count);
  return {
    id: row.id,
    name: row.name,
    owner: { id: row.owner_id, name: row.owner_name },
    visibility: row.visibility,
    sampleRate: row.sample_rate,
    centerFrequency: row.center_frequency,
    datatype: row.datatype,
    layout: row.layout,
    sampleCount,
    byteSize: Number(row.byte_size),
    bytesPerSample: bytesPerSampleOf(parseDatatype(row.datatype), row.layout),
    durationSeconds: sampleCount / row.sample_rate,
    sha256: row.sha256,
    source: row.source,
    synthSpec: parseJsonColumn<unknown>(row.synth_spec, null),
    notes: row.notes,
    tags: parseJsonColumn<string[]>(row.tags, []),
    annotations: parseJsonColumn<Record<string, unknown>[]>(row.annotations, []),
    createdAt: new Date(row.created_at).toISOString(),
    permissions: { update: can(viewer, 'capture.update', resource), delete: can(viewer, 'capture.delete', resource) },
  };
}
