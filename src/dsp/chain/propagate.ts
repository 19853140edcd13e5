/**
 * Propagation: the input and output format of every stage (sample rate, sample type, centre
 * frequency, band limit) and the problems a run would meet, found before running. Besides what each
 * kind reports from its own `propagate` (e.g. an unstable IIR), the chain checks what no single
 * stage can see: a stage fed a sample type it does not accept, a filter edge at or above the
 * Nyquist frequency of its input, and a rate reduction with no anti-alias filter before it or whose
 * new Nyquist frequency lies below the preceding filter's stop-band edge.
 */
import { valuesPerSample, type ChainIssue, type StageDefinition, type StreamFormat } from '../types';
import { stageDefinitions } from '../stages/index';
import type { ChainDocument } from './document';
import { ISSUE_CODES } from './issue-codes';
import { describeZodIssue, fieldPath, formatFrequency, stageLabel } from './messages';

/** Formats and issues of one stage. */
export interface StagePropagation {
  stageId: string;
  kind: string;
  input: StreamFormat;
  output: StreamFormat;
  issues: ChainIssue[];
}

/** Internal form: also the definition and the parsed parameters, for the runner. */
export interface ResolvedStage extends StagePropagation {
  index: number;
  bypass: boolean;
  probe: boolean;
  definition?: StageDefinition<any>;
  params?: unknown;
}

/** Parameters that hold a filter edge frequency (Hz) in the filter kinds. */
const EDGE_FIELDS = ['cutoff', 'low', 'high'] as const;

/** Tolerance for comparing frequencies computed from rates (Hz, relative). */
const RELATIVE_SLACK = 1e-9;

/** Check an input format; throws RangeError naming the field. */
export function checkStreamFormat(format: StreamFormat, name = 'inputFormat'): void {
  if (typeof format !== 'object' || format === null) throw new TypeError(`${name}: must be a stream format object`);
  if (typeof format.sampleRate !== 'number' || !Number.isFinite(format.sampleRate) || format.sampleRate <= 0) {
    throw new RangeError(`${name}.sampleRate: must be a finite number > 0 Hz, got ${String(format.sampleRate)}`);
  }
  if (format.sampleType !== 'real' && format.sampleType !== 'complex' && format.sampleType !== 'real-pair') {
    throw new RangeError(`${name}.sampleType: must be 'real', 'complex' or 'real-pair', got ${JSON.stringify(format.sampleType)}`);
  }
  valuesPerSample(format.sampleType);
}

function withStage(issue: ChainIssue, label: string, stageId: string, stageIndex: number): ChainIssue {
  const fieldPrefix = issue.field && !issue.message.startsWith(issue.field) ? `${issue.field}: ` : '';
  return { ...issue, stageId, stageIndex, message: `${label}: ${fieldPrefix}${issue.message}` };
}

/** Chain-level checks of one (not bypassed, accepted) stage, skipping fields the stage already reported on. */
function chainChecks(params: Record<string, unknown>, input: StreamFormat, output: StreamFormat, reported: ChainIssue[]): ChainIssue[] {
  const issues: ChainIssue[] = [];
  const reportedFields = new Set(reported.map((i) => i.field));
  const reportedCodes = new Set(reported.map((i) => i.code));
  const nyquist = input.sampleRate / 2;
  for (const field of EDGE_FIELDS) {
    const edge = params[field];
    if (typeof edge !== 'number' || reportedFields.has(field) || reportedCodes.has(ISSUE_CODES.cutoffAboveNyquist)) continue;
    if (Math.abs(edge) >= nyquist * (1 - RELATIVE_SLACK)) {
      issues.push({
        severity: 'error',
        code: ISSUE_CODES.cutoffAboveNyquist,
        field,
        message: `${field}: ${formatFrequency(edge)} is at or above the Nyquist frequency ${formatFrequency(nyquist)} of the ${formatFrequency(input.sampleRate)} input`,
      });
    }
  }
  const decimationReported = reportedCodes.has(ISSUE_CODES.decimateWithoutAntiAlias) || reportedCodes.has(ISSUE_CODES.decimateAliasing);
  if (output.sampleRate < input.sampleRate * (1 - RELATIVE_SLACK) && params.antiAlias !== true && !decimationReported) {
    const newNyquist = output.sampleRate / 2;
    const factor = Number((input.sampleRate / output.sampleRate).toPrecision(6));
    if (input.bandLimit === undefined) {
      issues.push({
        severity: 'warning',
        code: ISSUE_CODES.decimateWithoutAntiAlias,
        message: `reduces the rate by ${factor} with no anti-alias filter before it: everything above the new Nyquist frequency ${formatFrequency(newNyquist)} folds onto the band (add a low-pass filter before it or turn on antiAlias)`,
      });
    } else if (input.bandLimit > newNyquist * (1 + RELATIVE_SLACK)) {
      issues.push({
        severity: 'warning',
        code: ISSUE_CODES.decimateAliasing,
        message: `the preceding filter's stop band starts at ${formatFrequency(input.bandLimit)}, above the new Nyquist frequency ${formatFrequency(newNyquist)} after reducing the rate by ${factor}: the band between them aliases`,
      });
    }
  }
  return issues;
}

/** Formats and issues of every stage, with the stage definitions and parsed parameters. */
export function resolveChain(doc: ChainDocument, inputFormat: StreamFormat, registry: Record<string, StageDefinition<any>> = stageDefinitions): ResolvedStage[] {
  checkStreamFormat(inputFormat);
  let current: StreamFormat = { ...inputFormat };
  return doc.stages.map((stage, index) => {
    const label = stageLabel(index, stage.id, stage.kind);
    const input = current;
    const resolved: ResolvedStage = { stageId: stage.id, kind: stage.kind, index, input, output: input, issues: [], bypass: stage.bypass, probe: stage.probe };
    const fail = (code: string, message: string, field?: string) => {
      resolved.issues.push(withStage({ severity: 'error', code, message, ...(field ? { field } : {}) }, label, stage.id, index));
    };
    const definition = Object.prototype.hasOwnProperty.call(registry, stage.kind) ? registry[stage.kind] : undefined;
    if (!definition) {
      fail(ISSUE_CODES.unknownStageKind, `kind: unknown stage kind ${JSON.stringify(stage.kind)}`, 'kind');
      return resolved;
    }
    resolved.definition = definition;
    const parsed = definition.schema.safeParse(stage.params ?? {});
    if (!parsed.success) {
      for (const zi of parsed.error.issues) {
        const field = fieldPath(zi.path);
        fail(ISSUE_CODES.invalidParameter, `${field || 'params'}: ${describeZodIssue(zi, definition.fields[String(zi.path[0])]?.unit)}`, field || undefined);
      }
      return resolved;
    }
    resolved.params = parsed.data;
    if (stage.bypass) return resolved;
    if (!definition.accepts.includes(input.sampleType)) {
      const hint = input.sampleType === 'real' ? ' (turn a real stream into complex with quadrature-mix)' : input.sampleType === 'real-pair' ? ' (turn two channels into complex with quadrature-combine)' : '';
      fail(ISSUE_CODES.inputTypeMismatch, `needs ${definition.accepts.join(' or ')} input, but is fed ${input.sampleType}${hint}`);
      return resolved;
    }
    try {
      const { output, issues } = definition.propagate(parsed.data, input);
      resolved.output = output;
      const own = issues.map((i) => withStage(i, label, stage.id, index));
      const extra = chainChecks(parsed.data as Record<string, unknown>, input, output, issues).map((i) => withStage(i, label, stage.id, index));
      resolved.issues.push(...own, ...extra);
    } catch (cause) {
      fail(ISSUE_CODES.propagateFailed, cause instanceof Error ? cause.message : String(cause));
    }
    current = resolved.output;
    return resolved;
  });
}

/**
 * For every stage of a (validated) chain: its input and output format for the given input format and
 * its issues, each naming the stage. A stage with errors passes its input format on unchanged so
 * that later stages are still checked. Throws RangeError when the input format itself is invalid.
 */
export function propagateChain(doc: ChainDocument, inputFormat: StreamFormat, registry: Record<string, StageDefinition<any>> = stageDefinitions): StagePropagation[] {
  return resolveChain(doc, inputFormat, registry).map(({ stageId, kind, input, output, issues }) => ({ stageId, kind, input, output, issues }));
}

/** The chain's final output format given its propagation (the input format when it has no stages). */
export function chainOutputFormat(propagation: StagePropagation[], inputFormat: StreamFormat): StreamFormat {
  return propagation.length > 0 ? propagation[propagation.length - 1].output : { ...inputFormat };
}

/** Every issue of a propagation, in stage order. */
export function propagationIssues(propagation: StagePropagation[]): ChainIssue[] {
  return propagation.flatMap((stage) => stage.issues);
}
