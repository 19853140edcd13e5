/**
 * What the user picked for upload, read in the browser before any byte travels: a SigMF pair
 * (meta + data), a `.sigmf` archive (its data member is sent as a slice, with its meta text), a
 * WAV file (header read for the form), or raw samples described by the form.
 */
import { FormatError, formatDatatype, parseDatatype } from '@/dsp/formats/datatype';
import { parseSigmfMeta, sigmfSampleShape } from '@/dsp/formats/sigmf-meta';
import { widenedPcm24Bytes } from '@/dsp/formats/pcm24';
import { WavReader } from '@/dsp/formats/wav-reader';
import type { SampleType } from '@/dsp/types';
import { readTarMembers } from './tar-members';
import type { Capture } from '@/contracts/capture';

/** What the file itself says about the samples (empty for raw data). */
/** What a file's header states of the capture's description. */
export type StatedByFile = Partial<Pick<Capture, 'datatype' | 'layout' | 'sampleRate' | 'centerFrequency'>>;

/** A picked upload, ready for the form. */
export interface PickedUpload {
  kind: 'sigmf' | 'wav' | 'raw';
  /** The bytes to send: the data file, the archive's data member, the WAV file or the raw file. */
  body: Blob;
  /** File name shown to the user. */
  fileName: string;
  /** Suggested capture name: the file name without its extension. */
  suggestedName: string;
  stated: StatedByFile;
  /** The `.sigmf-meta` text, sent with the upload so the server reads the same description. */
  sigmfMeta?: string;
  /** Bytes of samples (for WAV: the data chunk as declared). */
  sampleBytes: number;
  /** The sample bytes as the server stores and hashes them (a WAV's data chunk, not the whole file); null when the server converts them (24-bit WAV). */
  samplesBlob: Blob | null;
  /** What happens to a WAV encoding SigMF cannot name (24-bit PCM is stored widened to 32-bit). */
  note?: string;
}

/** A picked set of files that cannot be uploaded as it is, with the reason. */
export class PickError extends Error {}

function stem(name: string): string {
  const sigmf = /\.sigmf-(meta|data)$/i;
  return (sigmf.test(name) ? name.replace(sigmf, '') : name.replace(/\.[^.]{1,12}$/, '')) || name;
}

/** Reads the picked files into one upload, or throws PickError saying what is missing or wrong. */
export async function readPickedFiles(files: File[]): Promise<PickedUpload> {
  if (files.length === 0) throw new PickError('Choose a file to upload.');
  const meta = files.find((f) => /\.sigmf-meta$/i.test(f.name));
  const data = files.find((f) => /\.sigmf-data$/i.test(f.name));
  if (meta || data) {
    if (!meta) throw new PickError(`${data!.name} needs its .sigmf-meta file: choose both files together.`);
    if (!data) throw new PickError(`${meta.name} needs its .sigmf-data file: choose both files together.`);
    if (files.length > 2) throw new PickError('Choose one .sigmf-meta and one .sigmf-data file, nothing else.');
    return sigmfUpload(await meta.text(), data, data.name, stem(data.name));
  }
  if (files.length > 1) throw new PickError('Choose one file (or one .sigmf-meta with its .sigmf-data).');
  const file = files[0];
  if (/\.sigmf$/i.test(file.name)) return archiveUpload(file);
  if (/\.wave?$/i.test(file.name)) return wavUpload(file);
  return { kind: 'raw', body: file, fileName: file.name, suggestedName: stem(file.name), stated: {}, sampleBytes: file.size, samplesBlob: file };
}

function sigmfUpload(metaText: string, data: Blob, fileName: string, suggestedName: string): PickedUpload {
  try {
    const meta = parseSigmfMeta(metaText);
    const shape = sigmfSampleShape(meta);
    return {
      kind: 'sigmf',
      body: data,
      fileName,
      suggestedName,
      sigmfMeta: metaText,
      sampleBytes: data.size,
      samplesBlob: data,
      stated: {
        datatype: shape.datatype.name,
        layout: shape.layout,
        sampleRate: meta.global.sampleRate,
        centerFrequency: meta.captures[0]?.frequency ?? null,
      },
    };
  } catch (error) {
    if (error instanceof FormatError) throw new PickError(`The .sigmf-meta is not valid: ${error.message}`);
    throw error;
  }
}

async function archiveUpload(file: File): Promise<PickedUpload> {
  const members = await readTarMembers(file);
  const metas = members.filter((m) => /\.sigmf-meta$/i.test(m.name));
  const datas = members.filter((m) => /\.sigmf-data$/i.test(m.name));
  if (metas.length !== 1 || datas.length !== 1) {
    throw new PickError(`${file.name} must hold exactly one .sigmf-meta and one .sigmf-data (found ${metas.length} and ${datas.length}).`);
  }
  const metaText = await file.slice(metas[0].offset, metas[0].offset + metas[0].size).text();
  const data = file.slice(datas[0].offset, datas[0].offset + datas[0].size);
  return sigmfUpload(metaText, data, file.name, stem(file.name));
}

async function wavUpload(file: File): Promise<PickedUpload> {
  const reader = new WavReader();
  const head = new Uint8Array(await file.slice(0, 64 * 1024).arrayBuffer());
  try {
    reader.push(head);
  } catch (error) {
    if (error instanceof FormatError) throw new PickError(`${file.name} is not a WAV file Quadrille can read: ${error.message}`);
    throw error;
  }
  if (!reader.format || reader.dataBytes === null) throw new PickError(`${file.name}: no fmt and data chunk within the first 64 KiB.`);
  let datatype: string | undefined;
  let note: string | undefined;
  let sampleBytes = reader.dataBytes;
  const { encoding } = reader.format;
  if (encoding.kind === 'i' && encoding.bits === 24) {
    // Stored widened to 32-bit (formats/pcm24.ts): a third more bytes than the data chunk.
    datatype = formatDatatype({ ...encoding, bits: 32 }, false);
    sampleBytes = widenedPcm24Bytes(reader.dataBytes);
    note = '24-bit PCM has no SigMF datatype: the samples are stored widened to 32-bit integers (same full scale, lossless, a third larger).';
  } else {
    try {
      datatype = formatDatatype(encoding, false);
    } catch {
      note = `${reader.format.bitsPerSample}-bit samples have no SigMF datatype.`;
    }
  }
  return {
    kind: 'wav',
    body: file,
    fileName: file.name,
    suggestedName: stem(file.name),
    sampleBytes,
    samplesBlob: sampleBytes === reader.dataBytes ? file.slice(dataOffset(head), dataOffset(head) + reader.dataBytes) : null,
    note,
    stated: { datatype, layout: reader.layout ?? undefined, sampleRate: reader.format.sampleRate, centerFrequency: null },
  };
}

/** Bytes per sample (every channel) of a datatype and layout; null when the datatype is unknown. */
export function bytesPerSample(datatype: string, layout: SampleType): number | null {
  try {
    const parsed = parseDatatype(datatype);
    return (parsed.bits / 8) * (layout === 'real' ? 1 : 2);
  } catch {
    return null;
  }
}

/** Offset of the first sample of a WAV file: the body of its `data` chunk (RIFF chunks are word aligned). */
function dataOffset(head: Uint8Array): number {
  const view = new DataView(head.buffer, head.byteOffset, head.byteLength);
  let position = 12;
  while (position + 8 <= head.length) {
    const id = String.fromCharCode(...head.subarray(position, position + 4));
    const size = view.getUint32(position + 4, true);
    if (id === 'data') return position + 8;
    position += 8 + size + (size % 2);
  }
  throw new PickError('No data chunk within the first 64 KiB of the WAV file.');
}
