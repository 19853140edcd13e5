/** Shared shapes: one zod schema per shape, with its type from z.infer. */
export * from './run-results';
export * from './run';
