/**
 * A synthesized capture: the synthesizer's bytes streamed into the store through the same
 * command as an upload (so quota, hashing, duplicates and clean-up behave the same), with the
 * spec kept so the capture can be made again.
 */
import type { Knex } from 'knex';
import type { Actor } from '@/lib/permissions';
import { createSynthByteSource, parseSynthSpec, SynthSpecError, type SynthSpec } from '@/dsp/synth';
import { parseDatatype } from '@/dsp/formats';
import type { ObjectStore } from '../storage';
import { badRequest } from '../api/errors';
import { captureAllowance, assertFits } from '../quota';
import { createCapture } from './create';
import { jsonFieldNames, type Visibility } from './metadata';
import type { CaptureWithOwner } from './rows';

/** Samples synthesized per chunk: big enough to keep the store busy, small enough to keep the event loop answering. */
const CHUNK_SAMPLES = 65_536;

/** What POST /api/synth and the demo seed ask for. */
export interface SynthRequest {
  /** Capture name; the spec's own name when absent. */
  name?: string;
  visibility?: Visibility;
  notes?: string;
  tags?: string[];
  /** The synthesizer spec (synthSpecSchema input). */
  spec: unknown;
}

/** Validates a spec; a problem becomes a 400 naming `spec.<field>`. */
export function parseSpecField(spec: unknown): SynthSpec {
  try {
    return parseSynthSpec(spec);
  } catch (error) {
    if (error instanceof SynthSpecError) {
      const first = error.issues[0];
      const field = `spec.${error.field}`;
      throw badRequest('invalid_field', `${field}: ${first?.message ?? error.message}`, field);
    }
    throw error;
  }
}

/** Synthesizes a capture for `owner` into the store; errors as createCapture's. */
export async function createSynthesizedCapture(db: Knex, store: ObjectStore, owner: Actor, input: SynthRequest): Promise<CaptureWithOwner> {
  const spec = parseSpecField(input.spec);
  const source = createSynthByteSource(spec);
  // The size is known before synthesis starts: refuse an oversized spec without computing it.
  assertFits(await captureAllowance(db, owner.id), source.byteLength, 'spec.duration');
  async function* chunks(): AsyncGenerator<Uint8Array, void, undefined> {
    for (let chunk = source.next(CHUNK_SAMPLES); chunk; chunk = source.next(CHUNK_SAMPLES)) yield chunk;
  }
  return createCapture(db, store, {
    owner,
    stated: {
      name: input.name ?? spec.name ?? undefined,
      datatype: parseDatatype(spec.datatype),
      layout: spec.layout,
      sampleRate: spec.sampleRate,
      centerFrequency: spec.centerFrequency,
      visibility: input.visibility,
      tags: input.tags,
      notes: input.notes,
    },
    names: { ...jsonFieldNames, datatype: 'spec.datatype', layout: 'spec.layout', sampleRate: 'spec.sampleRate', centerFrequency: 'spec.centerFrequency' },
    format: 'raw',
    source: chunks(),
    announcedBytes: source.byteLength,
    origin: 'synthesized',
    synthSpec: spec,
  });
}
