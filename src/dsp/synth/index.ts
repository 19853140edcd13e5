/** Capture synthesizer: spec schema, streaming synthesis, byte encoding, demo captures, playback caution. */
export * from './spec';
export * from './validate';
export * from './fields';
export * from './synthesizer';
export * from './encode';
export * from './demo';
export * from './safety';
export { Xoshiro128, GaussianSource } from './prng';
export { rootRaisedCosine, PulseTable } from './pulse-shape';
export { constellation, type Constellation, type DigitalModulation } from './constellation';
