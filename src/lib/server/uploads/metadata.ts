/**
 * The capture description carried in tus `Upload-Metadata`: the same fields as the JSON check
 * (name, datatype, sampleRate, centerFrequency, layout, visibility, tags, notes), plus either
 * `sigmfMeta` (the `.sigmf-meta` text of the data being sent) or `wav` (the body is a WAV file).
 */
import { FormatError, parseSigmfMeta } from '@/dsp/formats';
import { badRequest, unprocessable } from '../api/errors';
import {
  checkName,
  completeDescription,
  describeSigmf,
  jsonFieldNames,
  parseStatedFields,
  type CaptureDescription,
  type StatedFields,
  type UploadFormat,
} from '../captures';

// `filename` and `filetype` are what upload clients commonly add on their own; they are accepted and ignored.
const keys = ['name', 'datatype', 'sampleRate', 'centerFrequency', 'layout', 'visibility', 'tags', 'notes', 'sigmfMeta', 'wav', 'filename', 'filetype'];

/** What an upload's metadata says, checked. */
export interface UploadIntent {
  stated: StatedFields;
  /** Fields from `sigmfMeta`, if sent. */
  described: StatedFields;
  format: UploadFormat;
  asComplex: boolean;
  /** Complete when the bytes are raw samples (known before they travel); null for WAV. */
  description: CaptureDescription | null;
}

/** Parses tus metadata; errors name the metadata key (`sigmfMeta.global.core:datatype` for the meta's fields). */
export function parseUploadMetadata(metadata: Record<string, string | null | undefined>): UploadIntent {
  const unknown = Object.keys(metadata).find((key) => !keys.includes(key));
  if (unknown) throw badRequest('unknown_field', `Unknown upload metadata ${unknown}.`, unknown);
  const value = (key: string) => metadata[key] ?? undefined;
  const stated = parseStatedFields(
    {
      name: value('name'),
      datatype: value('datatype'),
      layout: value('layout'),
      sampleRate: value('sampleRate'),
      centerFrequency: value('centerFrequency'),
      visibility: value('visibility'),
      tags: value('tags'),
      notes: value('notes'),
    },
    jsonFieldNames,
  );
  const wav = value('wav') !== undefined && value('wav') !== '0' && value('wav') !== 'false';
  const metaText = value('sigmfMeta');
  if (wav && metaText !== undefined) throw badRequest('invalid_field', 'Send either sigmfMeta or wav, not both.', 'sigmfMeta');
  let described: StatedFields = {};
  if (metaText !== undefined) {
    try {
      described = describeSigmf(parseSigmfMeta(metaText));
    } catch (error) {
      if (error instanceof FormatError) {
        const field = `sigmfMeta.${error.field ?? ''}`.replace(/\.$/, '');
        throw unprocessable('invalid_field', `sigmfMeta: ${error.message}`, field);
      }
      throw error;
    }
  }
  const format: UploadFormat = wav ? 'wav' : 'raw';
  // A WAV header supplies everything but the name, and it is read only once all bytes are here.
  if (wav) checkName(stated.name, jsonFieldNames.name);
  const description = wav ? null : completeDescription(stated, described, jsonFieldNames);
  return { stated, described, format, asComplex: wav && stated.layout === 'complex', description };
}
