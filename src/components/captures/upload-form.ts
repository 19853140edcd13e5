/**
 * The upload form's values and the checks made before any byte travels: a known datatype that
 * fits the layout, a sample rate > 0, a finite centre frequency, and a byte count that is a whole
 * number of samples. The server repeats every check; these only save a wasted transfer.
 */
import { checkLayoutFits, parseDatatype, FormatError } from '@/dsp/formats';
import { captureLimits as limits, type DescribedField, type UploadDescription, type UploadValues } from '@/contracts/capture';
import { formatQuantity, parseQuantity } from '@/lib/units';
import type { PickedUpload } from './upload-files';

/** What the user typed or chose, and the checked description in the units the API takes (the capture contract's). */
export type { UploadDescription, UploadValues };

export type UploadField = 'file' | DescribedField;

export type UploadErrors = Partial<Record<UploadField, string>>;

const RATE_ALIASES = ['sps', 'S/s'];

/** Values the form starts with for a picked upload (what the file states, else the usual choices). */
export function initialValues(picked: PickedUpload | null, previous?: UploadValues): UploadValues {
  const stated = picked?.stated ?? {};
  return {
    name: picked?.suggestedName ?? previous?.name ?? '',
    datatype: stated.datatype ?? previous?.datatype ?? 'ci16_le',
    layout: stated.layout ?? previous?.layout ?? 'complex',
    sampleRate: stated.sampleRate !== undefined ? formatQuantity(stated.sampleRate, 'Hz', { significant: 12 }) : (previous?.sampleRate ?? ''),
    centerFrequency:
      stated.centerFrequency !== undefined && stated.centerFrequency !== null
        ? formatQuantity(stated.centerFrequency, 'Hz', { significant: 12 })
        : (previous?.centerFrequency ?? ''),
    visibility: previous?.visibility ?? 'team',
    tags: previous?.tags ?? '',
    notes: previous?.notes ?? '',
  };
}

/** The datatype the samples are stored as: a two-channel WAV taken as I/Q is stored as complex. */
export function storedDatatype(values: UploadValues): string {
  return values.layout === 'complex' && /^r/.test(values.datatype) ? 'c' + values.datatype.slice(1) : values.datatype;
}

/** Checks the form against the picked file; returns the description or the problems by field. */
export function checkUpload(values: UploadValues, picked: PickedUpload | null): { description: UploadDescription | null; errors: UploadErrors } {
  const errors: UploadErrors = {};
  if (!picked) errors.file = 'Choose a file to upload.';
  const name = values.name.trim();
  if (!name) errors.name = 'Give the capture a name.';
  else if (name.length > limits.name) errors.name = `At most ${limits.name} characters (this is ${name.length}).`;

  let bytesPerSample: number | null = null;
  const datatypeText = storedDatatype(values);
  // A WAV whose encoding SigMF cannot name is described (and converted) by the server alone.
  const serverDescribes = picked?.kind === 'wav' && !picked.stated.datatype;
  if (!serverDescribes) try {
    const datatype = parseDatatype(datatypeText);
    try {
      checkLayoutFits(values.layout, datatype);
      bytesPerSample = (datatype.bits / 8) * (values.layout === 'real' ? 1 : 2);
    } catch (error) {
      errors.layout = stripField((error as FormatError).message);
    }
  } catch (error) {
    errors.datatype = stripField((error as FormatError).message);
  }

  const rate = parseQuantity(values.sampleRate, 'Hz', { aliases: RATE_ALIASES });
  if (!rate.ok) errors.sampleRate = `Sample rate ${rate.message}.`;
  else if (!(rate.value > 0)) errors.sampleRate = 'Sample rate must be above 0 Hz.';

  let centerFrequency: number | null = null;
  if (values.centerFrequency.trim() !== '') {
    const centre = parseQuantity(values.centerFrequency, 'Hz');
    if (!centre.ok) errors.centerFrequency = `Centre frequency ${centre.message}.`;
    else centerFrequency = centre.value;
  }

  const tags = values.tags.split(',').map((t) => t.trim()).filter(Boolean);
  if (tags.some((t) => t.length > limits.tag)) errors.tags = `Each tag is at most ${limits.tag} characters.`;
  else if (tags.length > limits.tags) errors.tags = `At most ${limits.tags} tags (this is ${tags.length}).`;

  let sampleCount = 0;
  if (serverDescribes && picked) sampleCount = Number.NaN;
  else if (picked && bytesPerSample !== null && !errors.file) {
    if (picked.sampleBytes === 0) errors.file = `${picked.fileName} holds no samples (0 bytes).`;
    else if (picked.sampleBytes % bytesPerSample !== 0) {
      const extra = picked.sampleBytes % bytesPerSample;
      errors.file =
        `${picked.sampleBytes.toLocaleString('en')} bytes is not a whole number of ${bytesPerSample}-byte samples ` +
        `(${datatypeText}, ${values.layout}): ${extra} byte${extra === 1 ? '' : 's'} left over. Check the datatype and layout, or the file is cut short.`;
    } else sampleCount = picked.sampleBytes / bytesPerSample;
  }

  if (Object.keys(errors).length > 0 || !rate.ok) return { description: null, errors };
  return {
    description: { name, datatype: datatypeText, layout: values.layout, sampleRate: rate.value, centerFrequency, visibility: values.visibility, tags, notes: values.notes, sampleCount },
    errors,
  };
}

function stripField(message: string): string {
  const text = message.replace(/^(datatype|layout): /, '');
  return text.charAt(0).toUpperCase() + text.slice(1) + '.';
}

/** Maps a field named by the API (query, JSON or tus spelling) to the form field it is about. */
export function formFieldOf(apiField: string | null | undefined): UploadField | null {
  if (!apiField) return null;
  const base = apiField.replace(/^sigmfMeta.*/, 'file');
  const map: Record<string, UploadField> = {
    file: 'file', body: 'file', data: 'file', byteSize: 'file', 'Upload-Length': 'file',
    name: 'name', datatype: 'datatype', layout: 'layout',
    sampleRate: 'sampleRate', sample_rate: 'sampleRate',
    centerFrequency: 'centerFrequency', center_frequency: 'centerFrequency',
    visibility: 'visibility', tags: 'tags', notes: 'notes',
  };
  return map[base] ?? null;
}
