/** Chains: document schema and validation, propagation, canonical form and the runner. */
export { CHAIN_FORMAT_VERSION, chainOutlineSchema, MAX_STAGES, STAGE_ID_PATTERN, stageEnvelopeSchema } from './document';
export type { ChainDocument, ChainStage } from './document';
export { ISSUE_CODES } from './issue-codes';
export { describeZodIssue, fieldPath, formatFrequency, stageLabel } from './messages';
export { assertChainDocument, ChainDocumentError, chainDocumentSchema, parseChainDocument } from './parse';
export type { ChainParseResult } from './parse';
export { chainOutputFormat, checkStreamFormat, propagateChain, propagationIssues } from './propagate';
export type { StagePropagation } from './propagate';
export { canonicalChain, canonicalChainJson } from './canonical';
export type { CanonicalOptions } from './canonical';
export { abortError, ChainRunError, isAbortError } from './run-error';
export { runChain } from './runner';
export type { ChainRunResult, RunOptions, RunProgress } from './runner';
export { ConstellationSampler, DefaultProbe } from './default-probe';
export { buildResults, finiteJsonNumbers, runResultsSchema } from './results';
export type { ResultProbe, ResultReadout, ResultSpectrum, ResultsInput, RunFigures, RunResults } from './results';
