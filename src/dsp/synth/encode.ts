/**
 * Synthesized capture as bytes of its SigMF datatype, streamed block by block through the formats
 * SampleEncoder, so a capture of any length is written with flat memory and the same spec always
 * gives the same bytes.
 */
import { parseDatatype, type Datatype } from '../formats/datatype';
import { SampleEncoder } from '../formats/sample-encoder';
import { createSynthesizer, type Synthesizer } from './synthesizer';

/** A synthesizer together with the encoder for its datatype. */
export interface SynthByteSource {
  synthesizer: Synthesizer;
  datatype: Datatype;
  /** Bytes per sample (all channels). */
  bytesPerSample: number;
  /** Bytes of the whole capture. */
  byteLength: number;
  /** Bytes of up to `maxSamples` further samples (a new array), or null when the capture is complete. */
  next(maxSamples?: number): Uint8Array | null;
}

/** Start synthesizing a capture as bytes (throws SynthSpecError naming the field for a bad spec). */
export function createSynthByteSource(input: unknown): SynthByteSource {
  const synthesizer = createSynthesizer(input);
  const datatype = parseDatatype(synthesizer.spec.datatype);
  const encoder = new SampleEncoder(datatype, synthesizer.spec.layout);
  return {
    synthesizer,
    datatype,
    bytesPerSample: encoder.bytesPerSample,
    byteLength: encoder.bytesPerSample * synthesizer.totalSamples,
    next(maxSamples?: number): Uint8Array | null {
      const block = synthesizer.next(maxSamples);
      return block ? encoder.encode(block) : null;
    },
  };
}

/** The capture's bytes as a sequence of chunks of `blockSamples` samples each (the last may be shorter). */
export function* synthesizeBytes(input: unknown, blockSamples?: number): Generator<Uint8Array, void, undefined> {
  const source = createSynthByteSource(input);
  for (let chunk = source.next(blockSamples); chunk; chunk = source.next(blockSamples)) yield chunk;
}
