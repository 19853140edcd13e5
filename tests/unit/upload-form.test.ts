/**
 * The upload panel's checks before any byte travels, and its reading of `.sigmf` archives from
 * their tar headers alone.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkUpload, formFieldOf, initialValues, storedDatatype } from '@/components/captures/upload-form';
import type { PickedUpload } from '@/components/captures/upload-files';
import { readTarMembers } from '@/components/captures/tar-members';

function raw(bytes: number): PickedUpload {
  const blob = new Blob([new Uint8Array(bytes)]);
  return { kind: 'raw', body: blob, samplesBlob: blob, fileName: 'x.bin', suggestedName: 'x', stated: {}, sampleBytes: bytes };
}

const values = { ...initialValues(null), name: 'Bench', datatype: 'ci16_le', layout: 'complex' as const, sampleRate: '4 MHz' };

describe('checkUpload', () => {
  it('describes a raw file in API units', () => {
    const { description, errors } = checkUpload({ ...values, centerFrequency: '2.412G', tags: 'a, b ,,c' }, raw(4000));
    expect(errors).toEqual({});
    // ci16_le complex: 2 x 16-bit values per sample = 4 bytes (SigMF v1.2 datatype rules).
    expect(description).toMatchObject({ sampleRate: 4e6, centerFrequency: 2.412e9, sampleCount: 1000, tags: ['a', 'b', 'c'] });
  });

  it('refuses a byte count that is not a whole number of samples, beside the file', () => {
    const { description, errors } = checkUpload(values, raw(4002));
    expect(description).toBeNull();
    expect(errors.file).toMatch(/4,002 bytes is not a whole number of 4-byte samples \(ci16_le, complex\): 2 bytes left over/);
  });

  it('names each field that is wrong', () => {
    const { errors } = checkUpload({ ...values, name: ' ', datatype: 'ci17_le', sampleRate: '-4M', centerFrequency: '2.4 X' }, raw(4000));
    expect(errors.name).toMatch(/name/i);
    expect(errors.datatype).toMatch(/Unknown datatype "ci17_le"/);
    expect(errors.sampleRate).toMatch(/above 0 Hz/);
    expect(errors.centerFrequency).toMatch(/"X" is not a unit/);
    expect(checkUpload({ ...values, sampleRate: '' }, raw(4000)).errors.sampleRate).toMatch(/is empty/);
  });

  it('refuses a layout the datatype cannot hold, and stores a two-channel WAV taken as I/Q as complex', () => {
    expect(checkUpload({ ...values, datatype: 'cf32_le', layout: 'real' }, raw(4000)).errors.layout).toMatch(/does not fit complex datatype/);
    expect(storedDatatype({ ...values, datatype: 'ri16_le', layout: 'complex' })).toBe('ci16_le');
    expect(checkUpload(values, null).errors.file).toMatch(/Choose a file/);
  });

  it('maps the API field names of every way in to form fields', () => {
    expect(formFieldOf('sample_rate')).toBe('sampleRate');
    expect(formFieldOf('centerFrequency')).toBe('centerFrequency');
    expect(formFieldOf('body')).toBe('file');
    expect(formFieldOf('sigmfMeta.global.core:datatype')).toBe('file');
    expect(formFieldOf('nonsense')).toBeNull();
  });
});

const hasTar = spawnSync('tar', ['--version']).status === 0;

describe.skipIf(!hasTar)('readTarMembers', () => {
  // Archives written by GNU tar in the POSIX ustar and pax formats (IEEE Std 1003.1).
  it.each(['ustar', 'pax'])('finds the members of a %s archive and where their bytes sit', async (format) => {
    const folder = mkdtempSync(join(tmpdir(), 'quadrille-tar-'));
    try {
      const long = 'a-recording-name-that-is-long-enough-to-need-more-than-the-hundred-bytes-of-a-header-name-field';
      spawnSync('mkdir', ['-p', join(folder, 'in', long)]);
      writeFileSync(join(folder, 'in', long, 'r.sigmf-meta'), '{"global":{}}');
      const data = Uint8Array.from({ length: 1500 }, (_, k) => k % 251);
      writeFileSync(join(folder, 'in', long, 'r.sigmf-data'), data);
      const made = spawnSync('tar', [`--format=${format}`, '-cf', join(folder, 'r.sigmf'), '-C', join(folder, 'in'), long]);
      if (format === 'ustar' && made.status !== 0) return; // ustar cannot hold this long a path on every tar
      const archive = new Blob([readFileSync(join(folder, 'r.sigmf'))]);
      const members = await readTarMembers(archive);
      const meta = members.find((m) => m.name.endsWith('r.sigmf-meta'))!;
      const body = members.find((m) => m.name.endsWith('r.sigmf-data'))!;
      expect(meta.name).toBe(`${long}/r.sigmf-meta`);
      expect(await archive.slice(meta.offset, meta.offset + meta.size).text()).toBe('{"global":{}}');
      expect(new Uint8Array(await archive.slice(body.offset, body.offset + body.size).arrayBuffer())).toEqual(data);
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
