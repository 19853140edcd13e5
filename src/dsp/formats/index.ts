/** Capture formats: SigMF datatypes and metadata, streaming sample decoding/encoding, WAV. */
export * from './datatype';
export * from './full-scale';
export * from './layout';
export * from './sample-decoder';
export * from './sample-encoder';
export * from './wav-format';
export * from './wav-reader';
export * from './wav-writer';
export * from './sigmf-meta';
export * from './pcm24';
