/**
 * Where a value sits in JSON text, so a problem the chain validator reports for
 * `stages[2].params.cutoff` can be underlined at the cut-off's value in the JSON view. A small
 * JSON reader that keeps the offsets of every key and value, and reports the offset of a syntax
 * error (the built-in parser's messages differ between engines).
 */
import type { ChainIssue } from '@/dsp/types';
import { ISSUE_CODES } from '@/dsp/chain/issue-codes';

/** A JSON value with its extent in the text (`from` inclusive, `to` exclusive, UTF-16 offsets). */
export type JsonNode =
  | { type: 'object'; from: number; to: number; entries: { key: string; keyFrom: number; keyTo: number; value: JsonNode }[] }
  | { type: 'array'; from: number; to: number; items: JsonNode[] }
  | { type: 'scalar'; from: number; to: number; value: unknown };

/** A syntax error at a text offset. */
export class JsonSyntaxError extends Error {
  override name = 'JsonSyntaxError';
  constructor(message: string, readonly offset: number) {
    super(message);
  }
}

/** Parse JSON text into positioned nodes; throws JsonSyntaxError with the offset of the problem. */
export function parseJsonPositions(text: string): JsonNode {
  let i = 0;
  const fail = (message: string): never => {
    throw new JsonSyntaxError(message, Math.min(i, text.length));
  };
  const space = () => {
    while (i < text.length && /\s/.test(text[i])) i++;
  };
  const describe = () => (i >= text.length ? 'the end of the text' : JSON.stringify(text[i]));
  const stringToken = (): string => {
    const start = i;
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text.charCodeAt(i) < 0x20) fail('a string may not hold a raw control character or line break');
      i++;
    }
    if (i >= text.length) {
      i = start;
      fail('this string is never closed (missing ")');
    }
    i++;
    try {
      return JSON.parse(text.slice(start, i)) as string;
    } catch {
      i = start;
      return fail('this string holds an invalid escape');
    }
  };
  const value = (): JsonNode => {
    space();
    const from = i;
    const c = text[i];
    if (c === '{') {
      i++;
      const entries: Extract<JsonNode, { type: 'object' }>['entries'] = [];
      space();
      if (text[i] === '}') {
        i++;
        return { type: 'object', from, to: i, entries };
      }
      for (;;) {
        space();
        if (text[i] !== '"') fail(`expected a key in double quotes, found ${describe()}`);
        const keyFrom = i;
        const key = stringToken();
        const keyTo = i;
        space();
        if (text[i] !== ':') fail(`expected ':' after the key "${key}", found ${describe()}`);
        i++;
        entries.push({ key, keyFrom, keyTo, value: value() });
        space();
        if (text[i] === ',') {
          const comma = i++;
          space();
          if (text[i] === '}') {
            i = comma;
            fail('a trailing comma is not allowed before }');
          }
          continue;
        }
        if (text[i] === '}') {
          i++;
          return { type: 'object', from, to: i, entries };
        }
        fail(`expected ',' or '}' after the value of "${key}", found ${describe()}`);
      }
    }
    if (c === '[') {
      i++;
      const items: JsonNode[] = [];
      space();
      if (text[i] === ']') {
        i++;
        return { type: 'array', from, to: i, items };
      }
      for (;;) {
        items.push(value());
        space();
        if (text[i] === ',') {
          const comma = i++;
          space();
          if (text[i] === ']') {
            i = comma;
            fail('a trailing comma is not allowed before ]');
          }
          continue;
        }
        if (text[i] === ']') {
          i++;
          return { type: 'array', from, to: i, items };
        }
        fail(`expected ',' or ']' in the list, found ${describe()}`);
      }
    }
    if (c === '"') return { type: 'scalar', from, value: stringToken(), to: i };
    const literal = /^(?:true|false|null|-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?)/.exec(text.slice(i, i + 400));
    if (!literal) return fail(`expected a value (object, list, string, number, true, false or null), found ${describe()}`);
    i += literal[0].length;
    return { type: 'scalar', from, to: i, value: JSON.parse(literal[0]) };
  };
  const root = value();
  space();
  if (i < text.length) fail(`unexpected ${describe()} after the end of the document`);
  return root;
}

/** The plain value of a positioned node. */
export function nodeValue(node: JsonNode): unknown {
  if (node.type === 'scalar') return node.value;
  if (node.type === 'array') return node.items.map(nodeValue);
  return Object.fromEntries(node.entries.map((e) => [e.key, nodeValue(e.value)]));
}

/** `coefficients[3]` or `band.low` as path parts: ['coefficients', 3], ['band', 'low']. */
export function splitFieldPath(field: string): (string | number)[] {
  const parts: (string | number)[] = [];
  for (const match of field.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) parts.push(match[2] !== undefined ? Number(match[2]) : match[1]);
  return parts;
}

// Fields of a stage itself; any other field of a stage issue is one of its parameters.
const STAGE_FIELDS = new Set(['id', 'kind', 'params', 'probe', 'bypass']);
const PARAMETER_CODES = new Set<string>([ISSUE_CODES.invalidParameter, ISSUE_CODES.unknownParameter]);

/**
 * The JSON path an issue is about: `stages[i]` (the issue's stageIndex, else found by id), then
 * `params` and the field for parameter problems, or the stage's own field.
 */
export function issuePath(issue: ChainIssue, stages: readonly { id?: unknown }[]): (string | number)[] {
  if (issue.stageId === undefined) return issue.field ? splitFieldPath(issue.field) : [];
  const index = issue.stageIndex ?? stages.findIndex((s) => s.id === issue.stageId);
  if (index < 0) return [];
  const stagePath: (string | number)[] = ['stages', index];
  if (!issue.field) return stagePath;
  const field = splitFieldPath(issue.field);
  if (!PARAMETER_CODES.has(issue.code) && STAGE_FIELDS.has(String(field[0]))) return [...stagePath, ...field];
  return [...stagePath, 'params', ...field];
}

/**
 * The text range to mark for a path: the value at the path; for a key that is missing (a required
 * parameter) the key of the nearest object that exists; for an unknown key, the key itself.
 */
export function locatePath(root: JsonNode, path: (string | number)[], options: { markKey?: boolean } = {}): { from: number; to: number } {
  let node = root;
  let keyRange: { from: number; to: number } | undefined;
  for (const part of path) {
    if (node.type === 'object' && typeof part === 'string') {
      const entry = node.entries.find((e) => e.key === part);
      if (!entry) return keyRange ?? { from: node.from, to: Math.min(node.to, node.from + 1) };
      keyRange = { from: entry.keyFrom, to: entry.keyTo };
      node = entry.value;
    } else if (node.type === 'array' && typeof part === 'number' && part < node.items.length) {
      keyRange = undefined;
      node = node.items[part];
    } else {
      return keyRange ?? { from: node.from, to: Math.min(node.to, node.from + 1) };
    }
  }
  if (options.markKey && keyRange) return keyRange;
  // A whole object or list would underline half the screen: mark its first character only.
  if (node.type !== 'scalar') return keyRange ?? { from: node.from, to: node.from + 1 };
  return { from: node.from, to: node.to };
}

/** Range of an issue in the text of the document `root` was parsed from. */
export function locateIssue(root: JsonNode, issue: ChainIssue): { from: number; to: number } {
  const value = nodeValue(root) as { stages?: unknown };
  const stages = Array.isArray(value?.stages) ? (value.stages as { id?: unknown }[]) : [];
  return locatePath(root, issuePath(issue, stages), { markKey: issue.code === ISSUE_CODES.unknownParameter });
}
