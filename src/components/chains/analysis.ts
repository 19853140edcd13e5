/**
 * Everything the notebook shows about a document before running it: whether it is valid (and the
 * problems if not), the format after every stage and the propagation warnings, grouped by stage.
 * Runs on every edit, so it is pure and fast (no filter responses here).
 */
import { parseChainDocument, type ChainParseResult } from '@/dsp/chain/parse';
import { propagateChain, type StagePropagation } from '@/dsp/chain/propagate';
import type { ChainIssue, StreamFormat } from '@/dsp/types';
import type { DraftDocument } from './draft';

export interface NotebookAnalysis {
  parse: ChainParseResult;
  /** Per stage, in document order; absent when there is no input format to propagate. */
  propagation?: StagePropagation[];
  /** Problems of each stage (validation and propagation, without repeats), by stage id. */
  stageIssues: Map<string, ChainIssue[]>;
  /** Problems of the document itself (version, name...). */
  documentIssues: ChainIssue[];
  errorCount: number;
  warningCount: number;
}

const key = (i: ChainIssue) => `${i.stageId}|${i.code}|${i.field}|${i.message}`;

/** Validation and propagation of a draft fed `input` (an invalid draft is still propagated stage by stage). */
export function analyseDraft(doc: DraftDocument, input: StreamFormat | undefined): NotebookAnalysis {
  const parse = parseChainDocument(doc);
  let propagation: StagePropagation[] | undefined;
  if (input) {
    try {
      // Stages with bad parameters pass their input on unchanged, so later stages are still checked.
      propagation = propagateChain(parse.ok ? parse.document : doc, input);
    } catch {
      propagation = undefined;
    }
  }
  const seen = new Set<string>();
  const stageIssues = new Map<string, ChainIssue[]>();
  const documentIssues: ChainIssue[] = [];
  const all = [...(parse.ok ? [] : parse.issues), ...(propagation?.flatMap((p) => p.issues) ?? [])];
  for (const issue of all) {
    if (seen.has(key(issue))) continue;
    seen.add(key(issue));
    if (issue.stageId === undefined) documentIssues.push(issue);
    else stageIssues.set(issue.stageId, [...(stageIssues.get(issue.stageId) ?? []), issue]);
  }
  const errorCount = all.filter((i, n) => i.severity === 'error' && all.findIndex((j) => key(j) === key(i)) === n).length;
  return { parse, propagation, stageIssues, documentIssues, errorCount, warningCount: seen.size - errorCount };
}

/** An issue's message without the stage label it starts with, for display inside that stage's cell. */
export function messageInCell(issue: ChainIssue): string {
  return issue.message.replace(/^stages\[\d+\] \([^)]*\): /, '');
}

/** Whether an issue concerns a parameter (shown beside that field) rather than the stage as a whole. */
export function parameterOf(issue: ChainIssue): string | undefined {
  if (!issue.field) return undefined;
  const name = issue.field.split(/[.[]/, 1)[0];
  return ['id', 'kind', 'probe', 'bypass', 'params'].includes(name) ? undefined : name;
}
