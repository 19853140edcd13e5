/**
 * The annotation editor's reading of typed text into a SigMF annotation: times or sample numbers
 * into samples, RF edges into Hz, each problem on its field; and where a server error lands.
 * Field names and their meaning follow the SigMF core namespace (SigMF specification v1.2.0,
 * "Annotation Segment Objects", from memory: core:sample_start, core:sample_count, core:freq_lower_edge and
 * core:freq_upper_edge in Hz, core:label, core:comment).
 */
import { describe, expect, it } from 'vitest';
import {
  annotationFormSchema,
  annotationValues,
  emptyAnnotationValues,
  formatSampleTime,
  listWith,
  mergeAnnotation,
  parseSamples,
  placeServerError,
} from '@/components/captures/annotation-form';

// The demo's rev A capture: 4 Msps for 0.25 s (src/dsp/synth/demo.ts).
const context = { sampleRate: 4e6, sampleCount: 1_000_000 };
const schema = annotationFormSchema(context);
const values = (over: Partial<ReturnType<typeof emptyAnnotationValues>>) => ({ ...emptyAnnotationValues(), ...over });

function issues(input: ReturnType<typeof emptyAnnotationValues>): Record<string, string> {
  const parsed = schema.safeParse(input);
  if (parsed.success) return {};
  return Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message]));
}

describe('parseSamples', () => {
  it('reads a time with an SI prefix as the nearest sample at the rate', () => {
    // n = t * fs: 12.5 ms at 4 Msps is sample 50000 (definition of the sample rate).
    expect(parseSamples('12.5 ms', 4e6)).toEqual({ ok: true, samples: 50_000, fromTime: true });
    expect(parseSamples('250us', 4e6)).toEqual({ ok: true, samples: 1000, fromTime: true });
    // 0.3 us is 1.2 samples: the nearest sample is 1.
    expect(parseSamples('0.3 µs', 4e6)).toEqual({ ok: true, samples: 1, fromTime: true });
  });

  it('reads a number without a unit as a sample number', () => {
    expect(parseSamples('50000', 4e6)).toEqual({ ok: true, samples: 50_000, fromTime: false });
    expect(parseSamples('50,000 samples', 4e6)).toEqual({ ok: true, samples: 50_000, fromTime: false });
  });

  it('refuses a fractional sample number, a negative value and text that is neither', () => {
    const fraction = parseSamples('12.5', 4e6);
    expect(fraction.ok).toBe(false);
    if (!fraction.ok) expect(fraction.message).toMatch(/not a whole sample number/);
    expect(parseSamples('-1 ms', 4e6)).toMatchObject({ ok: false, message: 'must not be negative' });
    const junk = parseSamples('soon', 4e6);
    expect(junk.ok).toBe(false);
    if (!junk.ok) expect(junk.message).toMatch(/neither a time .* nor a sample number/);
  });
});

describe('formatSampleTime', () => {
  it('writes the shortest time that reads back as the same sample', () => {
    expect(formatSampleTime(50_000, 4e6)).toBe('12.5 ms');
    expect(formatSampleTime(0, 4e6)).toBe('0 s');
    // 65537 samples at 4 Msps = 16.38425 ms. "16.38 ms" reads back as 65520; "16.3842 ms" is
    // 65536.8 samples, whose nearest sample is 65537 again.
    expect(formatSampleTime(65_537, 4e6)).toBe('16.3842 ms');
    for (const n of [1, 7, 123_457, 999_999]) expect(parseSamples(formatSampleTime(n, 4e6), 4e6)).toMatchObject({ ok: true, samples: n });
  });

  it('writes a minute or more in plain seconds so the field reads it back', () => {
    // 90 s at 48 kHz (a long audio-rate capture).
    expect(formatSampleTime(90 * 48_000, 48_000)).toBe('90 s');
  });
});

describe('annotationFormSchema', () => {
  it('builds a SigMF annotation in samples and Hz', () => {
    const parsed = schema.parse(
      values({ label: ' beacon burst ', start: '12.5 ms', duration: '2 ms', lowerEdge: '2.4121 GHz', upperEdge: '2413.1 MHz', comment: 'QPSK' }),
    );
    expect(parsed).toEqual({
      'core:sample_start': 50_000,
      'core:sample_count': 8_000,
      'core:freq_lower_edge': 2.4121e9,
      'core:freq_upper_edge': 2.4131e9,
      'core:label': 'beacon burst',
      'core:comment': 'QPSK',
    });
  });

  it('leaves out what was left empty', () => {
    expect(schema.parse(values({ start: '0' }))).toEqual({ 'core:sample_start': 0 });
  });

  it('puts each problem on its own field', () => {
    expect(issues(values({ start: '' }))).toHaveProperty('start', expect.stringMatching(/^Start is empty/));
    // 0.25 s is the capture's end: sample 1,000,000 does not exist.
    expect(issues(values({ start: '250 ms' }))).toHaveProperty('start', expect.stringMatching(/past the end of the capture \(250 ms, 1,000,000 samples\)/));
    expect(issues(values({ start: '200 ms', duration: '60 ms' }))).toHaveProperty('duration', expect.stringMatching(/at most 50 ms, 200,000 samples/));
    expect(issues(values({ start: '0', duration: '100 ns' }))).toHaveProperty('duration', expect.stringMatching(/shorter than one sample \(250 ns\)/));
    expect(issues(values({ start: '0', lowerEdge: '2.4 GHz' }))).toEqual({ upperEdge: 'Give both frequency edges, or neither.' });
    expect(issues(values({ start: '0', lowerEdge: '2.413 GHz', upperEdge: '2.412 GHz' }))).toEqual({
      upperEdge: 'Upper edge 2.412 GHz is below the lower edge 2.413 GHz.',
    });
    expect(issues(values({ start: '0', lowerEdge: '2,4 GHz', upperEdge: '2.5 GHz' }))).toHaveProperty('lowerEdge', expect.stringMatching(/decimal comma/));
  });

  it('round-trips an existing annotation through the form values', () => {
    const annotation = { sampleStart: 65_537, sampleCount: 4_000, freqLowerEdge: 2_412_345_678, freqUpperEdge: 2_412_845_678, label: 'x', comment: '' };
    const parsed = schema.parse(annotationValues(annotation, 4e6));
    expect(parsed).toMatchObject({ 'core:sample_start': 65_537, 'core:sample_count': 4_000, 'core:freq_lower_edge': 2_412_345_678, 'core:freq_upper_edge': 2_412_845_678 });
  });
});

describe('saving the list', () => {
  it('keeps extension keys of an edited annotation and drops cleared core keys', () => {
    const original = { 'core:sample_start': 10, 'core:comment': 'old', 'saltmarsh:snr_db': 12 };
    expect(mergeAnnotation(original, { 'core:sample_start': 20 })).toEqual({ 'core:sample_start': 20, 'saltmarsh:snr_db': 12 });
  });

  it('sends the list in sample_start order and says where the edited one went', () => {
    const list = [{ 'core:sample_start': 10 }, { 'core:sample_start': 30 }];
    const added = { 'core:sample_start': 20 };
    const { list: sent, position } = listWith(list, null, added);
    expect(sent.map((a) => a['core:sample_start'])).toEqual([10, 20, 30]);
    expect(position).toBe(1);
    const moved = { 'core:sample_start': 40 };
    expect(listWith(list, 0, moved)).toEqual({ list: [{ 'core:sample_start': 30 }, moved], position: 1 });
  });

  it("puts the server's field error on the form field of the annotation being saved", () => {
    const error = { field: 'annotations[2].core:sample_count', message: "annotations[2].core:sample_count: the annotation reaches past the capture's 1000 samples." };
    expect(placeServerError(error, 2)).toEqual({ field: 'duration', message: "The annotation reaches past the capture's 1000 samples." });
    expect(placeServerError(error, 1)).toEqual({ field: null, message: error.message });
    expect(placeServerError({ field: 'annotations[0].core:freq_lower_edge', message: 'x' }, 0).field).toBe('lowerEdge');
    expect(placeServerError({ field: 'annotations', message: 'at most 10000 annotations' }, 0).field).toBeNull();
  });
});
