/**
 * Shared shapes, one schema each (zod, with types from z.infer): what the server answers, what the
 * islands, the CLI, the workers and the preview worker read. May import only zod, src/contracts and
 * src/dsp (pure); the engine never imports it.
 */
export * from './capture';
export * from './chain';
export * from './errors';
export * from './run-results';
export * from './run';
export * from './spec';
