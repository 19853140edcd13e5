/**
 * Shapes captures for API answers (the contract the capture pages build on): never the row, so
 * storage keys and new columns cannot leak.
 */
import { can, type Actor } from '@/lib/permissions';
import { parseDatatype } from '@/dsp/formats';
import type { Capture } from '@/contracts/capture';
import { parseJsonColumn, type CaptureWithOwner } from './rows';
import { bytesPerSampleOf } from './ingest/whole-samples';

/** The capture as `viewer` sees it (the contract's Capture), with what `viewer` may do to it. */
export function presentCapture(row: CaptureWithOwner, viewer: Actor): Capture {
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
