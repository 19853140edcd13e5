/**
 * The error contract: facts (stage position and id, sample index, truncation) travel as fields of
 * the error, from where the engine finds them to the API body, and nothing reads them back out of a
 * message. Expected values are the positions built into each input here, not computed by the code.
 */
import { describe, expect, it } from 'vitest';
import { apiErrorBodySchema, apiErrorOf } from '@/contracts/errors';
import { parseChainDocument } from '@/dsp/chain';
import { FormatError, SampleDecoder, parseDatatype } from '@/dsp/formats';
import { apiErrorBody, ApiError } from '@/lib/server/api/errors';
import { invalidChain } from '@/lib/server/chains/document';
import { ingestError } from '@/lib/server/captures/errors';
import { describeFailure } from '../../workers/execute-run';

function cf32(values: number[]): Uint8Array {
  return new Uint8Array(new Float32Array(values).buffer);
}

describe('error body schema', () => {
  it('accepts the body the server renders, with its facts', () => {
    const body = apiErrorBody(new ApiError(422, 'invalid_chain', 'bad', 'document.stages[1].params.factor', {}, { stageIndex: 1, stageId: 'dec' }));
    expect(apiErrorBodySchema.parse(body)).toEqual({ error: { code: 'invalid_chain', message: 'bad', field: 'document.stages[1].params.factor', stageIndex: 1, stageId: 'dec' } });
  });

  it('refuses bodies that are not API errors', () => {
    expect(apiErrorOf({ error: { message: 'no code', field: null } })).toBeNull();
    expect(apiErrorOf({ error: { code: 'x', message: 'm', field: null, stageIndex: -1 } })).toBeNull();
    expect(apiErrorOf('<html>proxy error</html>')).toBeNull();
    expect(apiErrorOf({ error: { code: 'x', message: 'm', field: null }, capture: { id: 'c' } })).toEqual({ code: 'x', message: 'm', field: null });
  });
});

describe('chain validation issues carry the stage', () => {
  it('names the stage by position and id, also when the id is used twice', () => {
    const result = parseChainDocument({
      version: 1,
      name: 'twice',
      stages: [
        { id: 'a', kind: 'gain', params: {} },
        { id: 'b', kind: 'gain', params: {} },
        { id: 'a', kind: 'decimate', params: { factor: 1 } },
      ],
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.issues.map((issue) => issue.stageIndex)).toEqual([2, 2]);
    const body = apiErrorBody(invalidChain(result.issues.slice(1)));
    expect(body.error).toMatchObject({ code: 'invalid_chain', stageIndex: 2, stageId: 'a', field: 'document.stages[2].params.factor' });
  });

  it('uses the index, not the wording of the message', () => {
    const error = invalidChain([{ severity: 'error', code: 'invalid-parameter', message: 'stages[7] (id "x", gain): gainDb: too big', stageId: 'x', stageIndex: 0, field: 'gainDb' }]);
    expect(error.field).toBe('document.stages[0].params.gainDb');
    expect(apiErrorBody(error).error.stageIndex).toBe(0);
  });
});

describe('format errors carry a code and the sample', () => {
  it('a NaN names its sample index', () => {
    const decoder = new SampleDecoder(parseDatatype('cf32_le'), 'complex');
    // Samples 0..4 are fine, sample 5 holds NaN in Q.
    const values = Array.from({ length: 16 }, (_, k) => k / 16);
    values[11] = Number.NaN;
    const error = (() => {
      try {
        decoder.decode(cf32(values));
      } catch (caught) {
        return caught;
      }
      return null;
    })();
    expect(error).toBeInstanceOf(FormatError);
    expect((error as FormatError).sampleIndex).toBe(5);
  });

  it('a cut-off last sample is `truncated`', () => {
    const decoder = new SampleDecoder(parseDatatype('ci16_le'), 'complex');
    decoder.decode(new Uint8Array(4 * 3 + 1));
    expect(() => decoder.end()).toThrow(expect.objectContaining({ code: 'truncated', sampleIndex: 3 }));
  });

  it('the upload error follows the code, whatever the message says', () => {
    const truncated = ingestError(new FormatError('body: it stopped early', 'body', { code: 'truncated' }), null) as ApiError;
    expect(truncated.code).toBe('truncated');
    const wordy = ingestError(new FormatError('body: says truncated and ends but is not', 'body'), null) as ApiError;
    expect(wordy.code).toBe('invalid_body');
  });

  it('a run failing on the capture reports the sample index as a field', () => {
    const failure = describeFailure(new FormatError('data: value is not finite', 'data', { sampleIndex: 1234 }));
    expect(failure).toMatchObject({ kind: 'input', stageId: null, sampleIndex: 1234 });
    expect(describeFailure(new FormatError('data: sample 99 is bad', 'data')).sampleIndex).toBeNull();
  });
});
