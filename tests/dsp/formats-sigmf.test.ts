/**
 * SigMF metadata. Field names and rules from GNU Radio Foundation, "SigMF: The Signal Metadata
 * Format Specification", v1.2.0 (2024): global core:datatype and core:version required, captures
 * and annotations need core:sample_start, captures in increasing sample_start order.
 */
import { describe, expect, it } from 'vitest';
import { formatSigmfMeta, parseSigmfMeta, sigmfSampleShape, type SigmfMeta } from '@/dsp/formats';

const example = {
  global: {
    'core:datatype': 'ci16_le', 'core:version': '1.2.0', 'core:sample_rate': 4e6,
    'core:description': 'Saltmarsh rev A beacon', 'core:author': 'bench', 'core:hw': 'rev A receiver',
    'core:sha512': 'ab'.repeat(64), 'core:num_channels': 1, 'saltmarsh:unit': 17,
  },
  captures: [{ 'core:sample_start': 0, 'core:frequency': 2.4e9, 'core:datetime': '2025-03-01T10:00:00Z' }, { 'core:sample_start': 4000 }],
  annotations: [{ 'core:sample_start': 10, 'core:sample_count': 200, 'core:freq_lower_edge': 2.4006e9, 'core:freq_upper_edge': 2.4007e9, 'core:label': 'beacon', 'core:comment': 'QPSK' }],
};

describe('SigMF meta', () => {
  it('parses every core field', () => {
    const meta = parseSigmfMeta(JSON.stringify(example));
    expect(meta.global).toMatchObject({ datatype: 'ci16_le', version: '1.2.0', sampleRate: 4e6, description: 'Saltmarsh rev A beacon', author: 'bench', hw: 'rev A receiver', numChannels: 1 });
    expect(meta.global.extra).toEqual({ 'saltmarsh:unit': 17 });
    expect(meta.captures[0]).toMatchObject({ sampleStart: 0, frequency: 2.4e9, datetime: '2025-03-01T10:00:00Z' });
    expect(meta.annotations[0]).toMatchObject({ sampleStart: 10, sampleCount: 200, freqLowerEdge: 2.4006e9, freqUpperEdge: 2.4007e9, label: 'beacon', comment: 'QPSK' });
    expect(sigmfSampleShape(meta).layout).toBe('complex');
  });

  it('writes what it reads, extensions included', () => {
    const meta = parseSigmfMeta(example);
    const text = formatSigmfMeta(meta);
    expect(JSON.parse(text)).toEqual(example);
    expect(parseSigmfMeta(text)).toEqual(meta);
  });

  it('r datatype with two channels is real-pair', () => {
    const meta: SigmfMeta = { global: { datatype: 'ri16_le', version: '1.2.0', numChannels: 2, sampleRate: 1e6 }, captures: [{ sampleStart: 0 }], annotations: [] };
    expect(sigmfSampleShape(parseSigmfMeta(formatSigmfMeta(meta))).layout).toBe('real-pair');
  });

  const broken: [string, (doc: any) => void, RegExp][] = [
    ['missing datatype', (d) => delete d.global['core:datatype'], /global.core:datatype: missing \(required\)/],
    ['unknown datatype', (d) => (d.global['core:datatype'] = 'cf16_le'), /global.core:datatype: unknown datatype "cf16_le"/],
    ['missing version', (d) => delete d.global['core:version'], /global.core:version: missing/],
    ['zero sample rate', (d) => (d.global['core:sample_rate'] = 0), /global.core:sample_rate: must be > 0 Hz, got 0/],
    ['negative sample rate', (d) => (d.global['core:sample_rate'] = -1e6), /global.core:sample_rate: must be > 0 Hz, got -1000000/],
    ['text sample rate', (d) => (d.global['core:sample_rate'] = '4e6'), /global.core:sample_rate: must be a finite number/],
    ['bad sha512', (d) => (d.global['core:sha512'] = 'abc'), /global.core:sha512: must be 128 hexadecimal digits/],
    ['fractional channels', (d) => (d.global['core:num_channels'] = 1.5), /global.core:num_channels: must be a whole number/],
    ['capture without start', (d) => delete d.captures[1]['core:sample_start'], /captures\[1\].core:sample_start: missing/],
    ['captures out of order', (d) => (d.captures[1]['core:sample_start'] = 0), /captures\[1\].core:sample_start: captures must be in increasing/],
    ['bad datetime', (d) => (d.captures[0]['core:datetime'] = 'yesterday'), /captures\[0\].core:datetime: "yesterday" is not an ISO-8601/],
    ['negative annotation start', (d) => (d.annotations[0]['core:sample_start'] = -5), /annotations\[0\].core:sample_start: must be a whole number of samples >= 0/],
    ['edges upside down', (d) => (d.annotations[0]['core:freq_lower_edge'] = 3e9), /annotations\[0\].core:freq_lower_edge: 3000000000 Hz is above/],
    ['no global', (d) => delete d.global, /global: must be a JSON object \(missing\)/],
  ];
  it.each(broken)('%s is a clear error naming the field', (_, mutate, pattern) => {
    const doc = structuredClone(example);
    mutate(doc);
    expect(() => parseSigmfMeta(doc)).toThrow(pattern);
  });

  it('not JSON', () => expect(() => parseSigmfMeta('{"global":')).toThrow(/sigmf-meta: not valid JSON/));
});
