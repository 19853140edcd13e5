/**
 * The check every stored sample byte passes on its way to the object store: the byte count must
 * come to a whole number of samples, and float data must hold no NaN or infinity. Float data is
 * scanned on the way (one byte test per value on the exponent, see finite-scan.ts), because a
 * capture with a NaN would fail every later run; a refusal at upload names the sample. Integer
 * data needs no scan: every code is a valid sample.
 */
import { FormatError, type Datatype } from '@/dsp/formats';
import type { SampleType } from '@/dsp/types';
import { valuesPerSample } from '@/dsp/types';
import { FiniteScanner } from './finite-scan';

/** Bytes per sample (every channel) of a datatype in a layout. */
export function bytesPerSampleOf(datatype: Datatype, layout: SampleType): number {
  return (datatype.bits / 8) * valuesPerSample(layout);
}

/** FormatError for a byte count that is not a whole number of samples (field `field`). */
export function partialSampleError(bytes: number, bytesPerSample: number, datatype: Datatype, layout: SampleType, field = 'body'): FormatError {
  return new FormatError(
    `${field}: ${bytes} bytes is not a whole number of ${bytesPerSample}-byte samples (${datatype.name}, ${layout}); ${bytes % bytesPerSample} byte(s) left over`,
    field,
  );
}

/**
 * Passes `chunks` through unchanged while checking them; throws FormatError (field `body`) for
 * a non-finite float value, a partial last sample, or no sample at all.
 */
export async function* wholeSamples(
  chunks: AsyncIterable<Uint8Array>,
  datatype: Datatype,
  layout: SampleType,
): AsyncGenerator<Uint8Array, void, undefined> {
  const bytesPerSample = bytesPerSampleOf(datatype, layout);
  const scanner = datatype.kind === 'f' ? new FiniteScanner(datatype, layout) : null;
  let total = 0;
  for await (const chunk of chunks) {
    scanner?.scan(chunk);
    total += chunk.byteLength;
    yield chunk;
  }
  if (total === 0) throw new FormatError('body: the upload holds no sample bytes', 'body');
  if (total % bytesPerSample !== 0) throw partialSampleError(total, bytesPerSample, datatype, layout);
}
