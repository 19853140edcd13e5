/** Propagation of formats through a chain and the warnings it gives before a run. */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import type { StageDefinition, StreamFormat } from '@/dsp/types';
import { assertChainDocument, chainOutputFormat, propagateChain, propagationIssues } from '@/dsp/chain/index';
import { stageDefinitions } from '@/dsp/stages/index';
import { filterStage } from '@/dsp/stages/filter';
import { decimateStage } from '@/dsp/stages/decimate';

// The filter and decimate kinds come from the filters engineer's files; the registry gains them too.
const registry: Record<string, StageDefinition<any>> = { ...stageDefinitions, filter: filterStage, decimate: decimateStage };

const iq10M: StreamFormat = { sampleRate: 10e6, sampleType: 'complex', centerFrequency: 2.4e9 };

function chain(stages: unknown[]) {
  return assertChainDocument({ version: 1, name: 't', stages }, registry);
}

describe('propagateChain formats', () => {
  it('follows rate, type and centre frequency through a down-conversion chain', () => {
    const doc = chain([
      { id: 'shift', kind: 'mix', params: { frequency: -1.25e6 } },
      { id: 'lp', kind: 'filter', params: { design: 'window', cutoff: 400e3, taps: 127 } },
      { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false } },
    ]);
    const result = propagateChain(doc, iq10M, registry);
    expect(result.map((s) => [s.stageId, s.kind, s.input.sampleRate, s.output.sampleRate, s.output.sampleType])).toEqual([
      ['shift', 'mix', 10e6, 10e6, 'complex'],
      ['lp', 'filter', 10e6, 10e6, 'complex'],
      ['dec', 'decimate', 10e6, 1.25e6, 'complex'],
    ]);
    expect(result[0].output.centerFrequency).toBe(2.4e9 + 1.25e6);
    // The 127-tap low-pass at 400 kHz stops well below the new Nyquist frequency 625 kHz.
    expect(result[1].output.bandLimit).toBeGreaterThan(400e3);
    expect(result[1].output.bandLimit).toBeLessThan(625e3);
    expect(propagationIssues(result)).toEqual([]);
    expect(chainOutputFormat(result, iq10M)).toMatchObject({ sampleRate: 1.25e6, sampleType: 'complex' });
  });

  it('turns a real IF capture into complex with quadrature-mix', () => {
    const doc = chain([{ id: 'qm', kind: 'quadrature-mix', params: { loFrequency: 10.7e6 } }]);
    const [qm] = propagateChain(doc, { sampleRate: 40e6, sampleType: 'real' }, registry);
    expect(qm.output).toEqual({ sampleRate: 40e6, sampleType: 'complex' });
    expect(qm.issues).toEqual([]);
  });

  it('marks a mirrored spectrum and moves the centre frequency the mirrored way after it', () => {
    // I + jQ = x e^{+j w t}: a tone at LO + f lands at -f (common practice), so 0 Hz still stands
    // for RF c + LO and a component at +g for RF c + LO - g.
    const real: StreamFormat = { sampleRate: 1e6, sampleType: 'real', centerFrequency: 10e6 };
    const mirrored = propagateChain(chain([
      { id: 'qm', kind: 'quadrature-mix', params: { loFrequency: 100e3, convention: 'i-plus-jq' } },
      { id: 'shift', kind: 'mix', params: { frequency: 50e3 } },
    ]), real, registry);
    expect(mirrored[0].output).toMatchObject({ centerFrequency: 10.1e6, spectrumInverted: true });
    // The tone at -50 kHz (RF 10.15 MHz) moves to 0 Hz, which therefore stands for 10.15 MHz.
    expect(mirrored[1].output).toMatchObject({ centerFrequency: 10.15e6, spectrumInverted: true });
    const [upright] = propagateChain(chain([{ id: 'qm', kind: 'quadrature-mix', params: { loFrequency: 100e3, convention: 'i-minus-jq' } }]), real, registry);
    expect(upright.output.spectrumInverted).toBeUndefined();
    // quadrature-combine against the capture read as I + jQ: I - jQ or a swap mirror, both cancel.
    const pair: StreamFormat = { sampleRate: 1e6, sampleType: 'real-pair' };
    const combine = (params: object) => propagateChain(chain([{ id: 'qc', kind: 'quadrature-combine', params }]), pair, registry)[0].output.spectrumInverted;
    expect(combine({ convention: 'i-plus-jq' })).toBeUndefined();
    expect(combine({ convention: 'i-minus-jq' })).toBe(true);
    expect(combine({ convention: 'i-plus-jq', swap: true })).toBe(true);
    expect(combine({ convention: 'i-minus-jq', swap: true })).toBeUndefined();
  });

  it('passes the format unchanged through a bypassed stage', () => {
    const doc = chain([{ id: 'dec', kind: 'decimate', params: { factor: 4 }, bypass: true }]);
    const [dec] = propagateChain(doc, iq10M, registry);
    expect(dec.output).toEqual(iq10M);
    expect(chainOutputFormat([], iq10M)).toEqual(iq10M);
  });

  it('rejects an invalid input format', () => {
    expect(() => propagateChain(chain([]), { sampleRate: 0, sampleType: 'complex' }, registry)).toThrow('inputFormat.sampleRate: must be a finite number > 0 Hz, got 0');
  });
});

describe('propagateChain warnings', () => {
  it('a cut-off above Nyquist', () => {
    const doc = chain([{ id: 'lp', kind: 'filter', params: { design: 'window', cutoff: 6e6 } }]);
    const issues = propagationIssues(propagateChain(doc, iq10M, registry));
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ severity: 'error', code: 'cutoff-above-nyquist', stageId: 'lp', field: 'cutoff' });
    expect(issues[0].message).toMatch(/^stages\[0\] \(id "lp", filter\): cutoff: .*Nyquist/);
  });

  it('a decimation without any anti-alias filter', () => {
    const doc = chain([
      { id: 'shift', kind: 'mix', params: { frequency: -1.25e6 } },
      { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false } },
    ]);
    const issues = propagationIssues(propagateChain(doc, iq10M, registry));
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ severity: 'warning', code: 'decimate-without-anti-alias', stageId: 'dec' });
    expect(issues[0].message).toMatch(/^stages\[1\] \(id "dec", decimate\): /);
  });

  it('a decimation whose new Nyquist frequency lies below the preceding filter stop-band edge', () => {
    const doc = chain([
      { id: 'lp', kind: 'filter', params: { design: 'window', cutoff: 2e6, taps: 63 } },
      { id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: false } },
    ]);
    const issues = propagationIssues(propagateChain(doc, iq10M, registry));
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ severity: 'warning', code: 'decimate-aliasing', stageId: 'dec' });
  });

  it('no decimation warning with the built-in anti-alias filter', () => {
    const doc = chain([{ id: 'dec', kind: 'decimate', params: { factor: 8, antiAlias: true } }]);
    expect(propagationIssues(propagateChain(doc, iq10M, registry))).toEqual([]);
  });

  it('a real stream fed to a stage that needs complex input', () => {
    const doc = chain([
      { id: 'shift', kind: 'mix', params: { frequency: 1e3 } },
      { id: 'iq', kind: 'iq-correct' },
    ]);
    const result = propagateChain(doc, { sampleRate: 1e6, sampleType: 'real' }, registry);
    expect(result[0].issues).toEqual([
      {
        severity: 'error',
        code: 'input-type-mismatch',
        stageId: 'shift',
        stageIndex: 0,
        message: 'stages[0] (id "shift", mix): needs complex input, but is fed real (turn a real stream into complex with quadrature-mix)',
      },
    ]);
    // Later stages are still checked, with the stream as it arrives.
    expect(result[1].issues[0].code).toBe('input-type-mismatch');
  });

  it('two channels fed to a complex-only stage point at quadrature-combine; a bypassed combine does too', () => {
    const pair: StreamFormat = { sampleRate: 1e6, sampleType: 'real-pair' };
    const doc = chain([
      { id: 'qc', kind: 'quadrature-combine', bypass: true },
      { id: 'iq', kind: 'iq-correct' },
    ]);
    const issues = propagationIssues(propagateChain(doc, pair, registry));
    expect(issues).toHaveLength(1);
    expect(issues[0].message).toBe('stages[1] (id "iq", iq-correct): needs complex input, but is fed real-pair (turn two channels into complex with quadrature-combine)');
  });

  it('a stage-specific warning carries the stage and field', () => {
    const doc = chain([{ id: 'shift', kind: 'mix', params: { frequency: 7e6 } }]);
    const [issue] = propagationIssues(propagateChain(doc, iq10M, registry));
    expect(issue).toMatchObject({ code: 'frequency-above-nyquist', stageId: 'shift', field: 'frequency', severity: 'warning' });
    expect(issue.message.startsWith('stages[0] (id "shift", mix): frequency: ')).toBe(true);
  });
});

describe('chain-level checks on kinds that do not check for themselves', () => {
  // Stand-ins: a brick-wall low-pass that sets bandLimit, and a rate halver with no warnings of its own.
  const brickwall: StageDefinition<{ cutoff: number }> = {
    kind: 'brickwall',
    title: 'b',
    summary: 'b',
    schema: z.object({ cutoff: z.number() }).strict(),
    fields: { cutoff: { label: 'Cut-off', unit: 'Hz' } },
    accepts: ['complex'],
    propagate: (p, input) => ({ output: { ...input, bandLimit: p.cutoff }, issues: [] }),
    create: () => ({ process: (b) => b, finish: () => new Float32Array(0) }),
  };
  const halve: StageDefinition<Record<string, never>> = {
    kind: 'halve',
    title: 'h',
    summary: 'h',
    schema: z.object({}).strict(),
    fields: {},
    accepts: ['complex'],
    propagate: (_p, input) => ({ output: { ...input, sampleRate: input.sampleRate / 2 }, issues: [] }),
    create: () => ({ process: (b) => b, finish: () => new Float32Array(0) }),
  };
  const local = { ...stageDefinitions, brickwall, halve };
  const run = (stages: unknown[]) => propagationIssues(propagateChain(assertChainDocument({ version: 1, stages }, local), iq10M, local));

  it('flags a cut-off at or above Nyquist', () => {
    const [issue] = run([{ id: 'b', kind: 'brickwall', params: { cutoff: 5e6 } }]);
    expect(issue).toMatchObject({ code: 'cutoff-above-nyquist', field: 'cutoff', stageId: 'b' });
    expect(issue.message).toBe('stages[0] (id "b", brickwall): cutoff: 5 MHz is at or above the Nyquist frequency 5 MHz of the 10 MHz input');
  });

  it('flags any rate reduction without a band limit before it, or with one above the new Nyquist', () => {
    expect(run([{ id: 'h', kind: 'halve' }]).map((i) => i.code)).toEqual(['decimate-without-anti-alias']);
    const [aliasing] = run([
      { id: 'b', kind: 'brickwall', params: { cutoff: 3e6 } },
      { id: 'h', kind: 'halve' },
    ]);
    expect(aliasing.code).toBe('decimate-aliasing');
    expect(aliasing.message).toBe(
      "stages[1] (id \"h\", halve): the preceding filter's stop band starts at 3 MHz, above the new Nyquist frequency 2.5 MHz after reducing the rate by 2: the band between them aliases",
    );
    expect(run([{ id: 'b', kind: 'brickwall', params: { cutoff: 2e6 } }, { id: 'h', kind: 'halve' }])).toEqual([]);
  });

  it('a mix widens the band limit by the shift', () => {
    const result = propagateChain(
      assertChainDocument({ version: 1, stages: [{ id: 'b', kind: 'brickwall', params: { cutoff: 1e6 } }, { id: 'm', kind: 'mix', params: { frequency: 5e5 } }] }, local),
      iq10M,
      local,
    );
    expect(result[1].output.bandLimit).toBe(1.5e6);
  });
});
