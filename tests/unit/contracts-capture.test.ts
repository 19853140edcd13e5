/**
 * The capture contract: one schema that refuses a bad capture naming the field, the shapes cut
 * from it, and the one capture -> stream format conversion. Expected values are written out here.
 */
import { describe, expect, it } from 'vitest';
import {
  captureSchema, previewCaptureSchema, runJobCaptureSchema, streamFormatOf, uploadDescriptionSchema, type Capture,
} from '@/contracts/capture';
import { presentCapture } from '@/lib/server/captures/present';
import { runJobCaptureOf, type CaptureWithOwner } from '@/lib/server/captures/rows';
import { checkUpload } from '@/components/captures/upload-form';

const row: CaptureWithOwner = {
  id: '0b7c1a52-3f4e-4a55-9a43-0c1d2e3f4a5b',
  owner_id: 'u-1',
  owner_name: 'Ada',
  name: 'Beacon pass',
  visibility: 'team',
  sample_rate: 2_000_000,
  center_frequency: 433_920_000,
  datatype: 'ci16_le',
  layout: 'complex',
  sample_count: 1_000_000,
  byte_size: 4_000_000,
  sha256: 'a'.repeat(64),
  storage_key: 'captures/abc/data',
  source: 'uploaded',
  synth_spec: null,
  notes: '',
  tags: '["beacon"]',
  annotations: '[]',
  created_at: '2026-12-01T10:00:00.000Z',
  updated_at: '2026-12-01T10:00:00.000Z',
};

const capture: Capture = presentCapture(row, { id: 'u-1', role: 'engineer' } as never);

function issuePaths(value: unknown): string[] {
  const result = captureSchema.safeParse(value);
  return result.success ? [] : result.error.issues.map((issue) => issue.path.join('.'));
}

describe('capture schema', () => {
  it('accepts what the server presents', () => {
    expect(captureSchema.parse(capture)).toEqual(capture);
    // 1e6 samples of ci16 complex: 4 bytes each, 0.5 s at 2 MHz.
    expect(capture).toMatchObject({ bytesPerSample: 4, durationSeconds: 0.5, tags: ['beacon'] });
  });

  it('refuses a bad capture, naming the field', () => {
    expect(issuePaths({ ...capture, sampleRate: 0 })).toEqual(['sampleRate']);
    expect(issuePaths({ ...capture, datatype: 'cf33_le' })).toEqual(['datatype']);
    expect(issuePaths({ ...capture, layout: 'stereo' })).toEqual(['layout']);
    expect(issuePaths({ ...capture, centerFrequency: Number.POSITIVE_INFINITY })).toEqual(['centerFrequency']);
    expect(issuePaths({ ...capture, tags: ['x'.repeat(41)] })).toEqual(['tags.0']);
    expect(issuePaths({ ...capture, visibility: 'public' })).toEqual(['visibility']);
  });

  it('the datatype message is the engine parser\'s', () => {
    const result = captureSchema.safeParse({ ...capture, datatype: 'cf33_le' });
    expect(result.success).toBe(false);
    if (!result.success) expect(result.error.issues[0]!.message).toMatch(/unknown datatype "cf33_le"/);
  });
});

describe('shapes cut from the capture', () => {
  it('a run job gets the storage key and the format, nothing else', () => {
    expect(runJobCaptureSchema.strict().parse(runJobCaptureOf(row))).toEqual({
      id: row.id, name: 'Beacon pass', storageKey: 'captures/abc/data', datatype: 'ci16_le', layout: 'complex',
      sampleRate: 2_000_000, centerFrequency: 433_920_000, sampleCount: 1_000_000,
    });
  });

  it('the preview gets what it needs to fetch the head', () => {
    expect(previewCaptureSchema.parse(capture)).toEqual({
      id: row.id, datatype: 'ci16_le', layout: 'complex', sampleRate: 2_000_000, centerFrequency: 433_920_000, sampleCount: 1_000_000, bytesPerSample: 4,
    });
  });

  it('the upload form produces a description the contract accepts', () => {
    const picked = { kind: 'raw', body: new Blob([]), fileName: 'x.raw', suggestedName: 'x', stated: {}, sampleBytes: 4000, samplesBlob: null } as never;
    const values = { name: 'x', datatype: 'ci16_le', layout: 'complex' as const, sampleRate: '2 MHz', centerFrequency: '', visibility: 'team' as const, tags: 'a, b', notes: '' };
    const { description } = checkUpload(values, picked);
    expect(uploadDescriptionSchema.parse(description)).toEqual({
      name: 'x', datatype: 'ci16_le', layout: 'complex', sampleRate: 2_000_000, centerFrequency: null, visibility: 'team', tags: ['a', 'b'], notes: '', sampleCount: 1000,
    });
  });
});

describe('streamFormatOf', () => {
  it('maps layout to sample type and keeps a known centre frequency', () => {
    expect(streamFormatOf({ sampleRate: 48_000, layout: 'real-pair', centerFrequency: 10e6 })).toEqual({ sampleRate: 48_000, sampleType: 'real-pair', centerFrequency: 10e6 });
  });

  it('leaves out an unknown centre frequency rather than passing null', () => {
    expect(streamFormatOf({ sampleRate: 1e6, layout: 'complex', centerFrequency: null })).toEqual({ sampleRate: 1e6, sampleType: 'complex' });
  });
});
