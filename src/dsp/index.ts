/**
 * Public entry of the DSP engine: core types, chains (validation, propagation, runner), the stage
 * registry, capture formats and the spectral tools. Pure TypeScript: usable from the browser, the
 * worker threads and the command line alike.
 */
export * from './types';
export { ENGINE_VERSION } from './version';
export * from './chain/index';
export { getStageDefinition, listStageKinds, stageDefinitions } from './stages/index';
export * from './formats/index';
export * from './fft/index';
export * from './windows/index';
export * from './spectral/index';
export { estimateIqImbalance } from './measure/iq-imbalance';
export { imageRejectionDb } from './measure/image-rejection';
