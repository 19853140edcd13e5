/**
 * Public entry of the DSP engine: core types, chains (validation, propagation, runner), the stage
 * registry, capture formats, FFT, windows, spectral estimators, readouts, filter design and the
 * capture synthesizer. Pure TypeScript: usable from the browser, the worker threads and the command
 * line alike.
 */
export * from './types';
export { ENGINE_VERSION } from './version';
export * from './chain/index';
export * from './stages/index';
export * from './formats/index';
export * from './fft/index';
export * from './windows/index';
export * from './spectral/index';
export * from './measure/index';
export * from './filters/index';
export * from './synth/index';
// Names exported by two folders: the explicit choice wins over the star exports above.
export { besselI0 } from './windows/index';
export { fieldPath } from './chain/index';
