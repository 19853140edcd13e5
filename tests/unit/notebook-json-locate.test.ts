/**
 * Problems the chain validator reports by field path land on the right characters of the JSON
 * text, and syntax errors on the offset where the text stops being JSON.
 */
import { describe, expect, it } from 'vitest';
import { parseChainDocument } from '@/dsp/chain/parse';
import { issuePath, JsonSyntaxError, locateIssue, locatePath, nodeValue, parseJsonPositions, splitFieldPath } from '@/components/chains/json-locate';

const text = `{
  "version": 1,
  "name": "Beacon",
  "stages": [
    { "id": "nco", "kind": "mix", "params": { "frequency": -600000 } },
    { "id": "lp", "kind": "filter", "params": { "design": "window", "cutoff": -5, "taps": 127 } },
    { "id": "taps", "kind": "filter", "params": { "design": "taps", "coefficients": [0.5, "x", 0.5] } },
    { "id": "dec", "kind": "decimate", "params": { "factor": 8, "speed": 2 } },
    { "id": "bp", "kind": "filter", "params": { "design": "window", "response": "bandpass", "low": 1000 } }
  ]
}`;

const at = (range: { from: number; to: number }) => text.slice(range.from, range.to);

describe('parseJsonPositions', () => {
  it('reads the same value as JSON.parse', () => {
    expect(nodeValue(parseJsonPositions(text))).toEqual(JSON.parse(text));
    expect(nodeValue(parseJsonPositions(' [1, -2.5e3, "a\\"b", true, null, {}] '))).toEqual([1, -2500, 'a"b', true, null, {}]);
  });

  it.each([
    ['{"a": 1,}', 7, /trailing comma/],
    ['{"a" 1}', 5, /expected ':'/],
    ['{"a": 1 "b": 2}', 8, /expected ',' or '}'/],
    ['[1, 2', 5, /expected ',' or '\]'/],
    ['{"a": "open}', 6, /never closed/],
    ['{"a": tru}', 6, /expected a value/],
    ['{} x', 3, /after the end/],
    ['', 0, /expected a value/],
  ])('%j fails at offset %i', (bad, offset, message) => {
    let caught: unknown;
    try {
      parseJsonPositions(bad);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(JsonSyntaxError);
    expect((caught as JsonSyntaxError).offset).toBe(offset);
    expect((caught as JsonSyntaxError).message).toMatch(message);
  });
});

describe('field path to text offset', () => {
  const root = parseJsonPositions(text);
  const result = parseChainDocument(JSON.parse(text));
  const issues = result.ok ? [] : result.issues;
  const find = (stageId: string, field: string) => issues.find((i) => i.stageId === stageId && i.field === field)!;

  it('splits field paths', () => {
    expect(splitFieldPath('coefficients[3]')).toEqual(['coefficients', 3]);
    expect(splitFieldPath('band.low')).toEqual(['band', 'low']);
  });

  it('marks a bad parameter value', () => {
    const issue = find('lp', 'cutoff');
    expect(issuePath(issue, JSON.parse(text).stages)).toEqual(['stages', 1, 'params', 'cutoff']);
    expect(at(locateIssue(root, issue))).toBe('-5');
  });

  it('marks one bad entry of a pasted list', () => {
    expect(at(locateIssue(root, find('taps', 'coefficients[1]')))).toBe('"x"');
  });

  it('marks the key of an unknown parameter', () => {
    expect(at(locateIssue(root, find('dec', 'speed')))).toBe('"speed"');
  });

  it('marks the params key when a required parameter is missing', () => {
    expect(at(locateIssue(root, find('bp', 'high')))).toBe('"params"');
  });

  it('marks stage and document fields', () => {
    expect(at(locatePath(root, ['stages', 3, 'kind']))).toBe('"decimate"');
    expect(at(locatePath(root, ['version']))).toBe('1');
    expect(at(locatePath(root, ['stages', 9]))).toBe('"stages"');
    expect(at(locatePath(root, ['missing']))).toBe('{');
  });

  it('finds the stage by its stageIndex, else by id', () => {
    expect(issuePath({ severity: 'error', code: 'invalid-parameter', stageId: 'dec', field: 'factor', message: 'factor: too big' }, JSON.parse(text).stages)).toEqual([
      'stages', 3, 'params', 'factor',
    ]);
    // A duplicated id names two stages: the index says which one, whatever the message says.
    expect(issuePath({ severity: 'error', code: 'duplicate-stage-id', stageId: 'dec', stageIndex: 3, field: 'id', message: 'id: duplicate' }, [])).toEqual([
      'stages', 3, 'id',
    ]);
  });
});
