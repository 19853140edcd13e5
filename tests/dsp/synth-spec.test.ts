import { describe, expect, test } from 'vitest';
import { z } from 'zod';
import { estimateIqImbalance } from '@/dsp/measure/iq-imbalance';
import {
  createSynthByteSource,
  createSynthesizer,
  demoSynthSpecs,
  parseSynthSpec,
  SynthSpecError,
  synthFields,
  synthSpecObject,
  synthSpecWarnings,
  TRANSMIT_CAUTION,
} from '@/dsp/synth';
import { db20 } from './synth-helpers';

function errorOf(input: unknown): SynthSpecError {
  try {
    parseSynthSpec(input);
  } catch (e) {
    if (e instanceof SynthSpecError) return e;
    throw e;
  }
  throw new Error('expected the spec to be refused');
}

/** Dot paths of every leaf field of a zod object schema (array items and union options merged). */
function leafPaths(schema: z.ZodTypeAny, prefix = ''): string[] {
  let s = schema;
  while (s instanceof z.ZodDefault || s instanceof z.ZodOptional || s instanceof z.ZodEffects) {
    s = s instanceof z.ZodEffects ? s.innerType() : s._def.innerType;
  }
  if (s instanceof z.ZodArray) return [prefix, ...leafPaths(s.element, prefix)];
  if (s instanceof z.ZodDiscriminatedUnion) return (s.options as z.ZodTypeAny[]).flatMap((o) => leafPaths(o, prefix));
  if (s instanceof z.ZodObject) {
    return Object.entries(s.shape as Record<string, z.ZodTypeAny>).flatMap(([key, value]) => leafPaths(value, prefix ? `${prefix}.${key}` : key));
  }
  return [prefix];
}

describe('spec schema', () => {
  test('an empty spec gets usable defaults', () => {
    const spec = parseSynthSpec({});
    expect(spec).toMatchObject({ sampleRate: 1e6, duration: 0.1, datatype: 'cf32_le', layout: 'complex', seed: 1 });
    expect(spec.tones).toHaveLength(1);
    expect(spec.noise).toEqual({ mode: 'total', level: -60 });
    expect(spec.impairments).toEqual({ gainImbalance: 0, phaseImbalance: 0, dcOffsetI: 0, dcOffsetQ: 0, frequencyOffset: 0, adcBits: 0, clip: true });
    expect(createSynthesizer({}).totalSamples).toBe(100_000);
  });

  test('every field of the schema has a label in synthFields, and nothing else is labelled', () => {
    const paths = [...new Set(leafPaths(synthSpecObject))].sort();
    expect(paths.filter((p) => !(p in synthFields))).toEqual([]);
    const nested = new Set(paths.flatMap((p) => p.split('.').map((_, k, parts) => parts.slice(0, k + 1).join('.'))));
    expect(Object.keys(synthFields).filter((k) => !nested.has(k))).toEqual([]);
  });

  test.each([
    [{ tones: [{ frequency: 600_000 }] }, 'tones[0].frequency', 'outside'],
    [{ layout: 'real', datatype: 'rf32_le', tones: [{ frequency: -1000 }] }, 'tones[0].frequency', '0 to fs/2'],
    [{ tones: [{ frequency: 490_000 }], impairments: { frequencyOffset: 20_000 } }, 'tones[0].frequency', 'frequency offset'],
    [{ carriers: [{ modulation: 'qpsk', symbolRate: 900_000 }] }, 'carriers[0].symbolRate', 'occupied bandwidth'],
    [{ carriers: [{ modulation: 'qam16', rollOff: 1.5 }] }, 'carriers[0].rollOff', '<= 1'],
    [{ carriers: [{ modulation: 'ofdm' }] }, 'carriers[0].modulation', ''],
    [{ carriers: [{ modulation: 'am', depth: 1.2 }] }, 'carriers[0].depth', 'over-modulation'],
    [{ datatype: 'cf33_le' }, 'datatype', 'unknown datatype'],
    [{ datatype: 'ri16_le' }, 'layout', 'complex layout needs a c datatype'],
    [{ layout: 'real-pair', datatype: 'ci16_le' }, 'layout', 'does not fit'],
    [{ layout: 'real', datatype: 'rf32_le', impairments: { phaseImbalance: 2 } }, 'impairments.phaseImbalance', 'real layout'],
    [{ layout: 'real', datatype: 'rf32_le', impairments: { dcOffsetQ: 0.1 } }, 'impairments.dcOffsetQ', 'dcOffsetI'],
    [{ impairments: { adcBits: 1 } }, 'impairments.adcBits', '2 to 24'],
    [{ impairments: { dcOffsetI: 2 } }, 'impairments.dcOffsetI', 'fraction of full scale'],
    [{ duration: 1e-9 }, 'duration', 'at least 1'],
    [{ duration: 1e6, sampleRate: 1e9 }, 'duration', 'at most'],
    [{ sampleRate: -5 }, 'sampleRate', '> 0 Hz'],
    [{ tones: [], noise: { mode: 'snr', snr: 20 } }, 'noise.snr', 'at least one tone'],
    [{ seed: 1.5 }, 'seed', 'integer'],
  ])('refuses %j naming %s', (input, field, words) => {
    const e = errorOf(input);
    expect(e.field).toBe(field);
    expect(e.message.startsWith(`${field}: `)).toBe(true);
    expect(e.message).toContain(words);
  });

  test('warns when a carrier band folds over Nyquist, not otherwise', () => {
    const folding = parseSynthSpec({ tones: [], carriers: [{ modulation: 'qpsk', frequency: 450_000, symbolRate: 200_000 }] });
    expect(synthSpecWarnings(folding).map((w) => [w.code, w.field])).toEqual([['carrier-band-folds', 'carriers[0].frequency']]);
    expect(synthSpecWarnings(parseSynthSpec({}))).toEqual([]);
  });

  test('maxSamples must be a positive integer', () => {
    expect(() => createSynthesizer({}).next(0)).toThrow(/maxSamples/);
    const synth = createSynthesizer({ duration: 1e-5 });
    expect(synth.next(1000)?.length).toBe(20);
    expect(synth.next(1000)).toBeNull();
  });
});

describe('demo captures (Saltmarsh Telemetry)', () => {
  test('every demo spec is valid, quiet, a few MB, with a fixed distinct seed', () => {
    const seeds = new Set<number>();
    for (const demo of demoSynthSpecs) {
      const spec = parseSynthSpec(demo.spec);
      expect(demo.name).toMatch(/Saltmarsh/);
      expect(synthSpecWarnings(spec)).toEqual([]);
      const source = createSynthByteSource(demo.spec);
      expect(source.byteLength).toBeGreaterThan(1e6);
      expect(source.byteLength).toBeLessThanOrEqual(10e6);
      seeds.add(spec.seed);
    }
    expect(seeds.size).toBe(demoSynthSpecs.length);
    expect(new Set(demoSynthSpecs.map((d) => d.slug)).size).toBe(demoSynthSpecs.length);
    expect(demoSynthSpecs.map((d) => parseSynthSpec(d.spec).layout).sort()).toEqual(['complex', 'complex', 'real', 'real-pair']);
  });

  test('rev A shows its imbalance and DC offset; rev B mostly fixed', () => {
    const head = (slug: string) => {
      const demo = demoSynthSpecs.find((d) => d.slug === slug)!;
      return estimateIqImbalance(createSynthesizer(demo.spec).next(1 << 19)!);
    };
    const a = head('saltmarsh-rev-a-beacon');
    const b = head('saltmarsh-rev-b-beacon');
    // Ellingson's blind estimate (2003) on the first 2^19 samples; the beacon and noise have equal
    // I and Q power, so what remains is the synthesized imbalance.
    expect(Math.abs(db20(a.gainRatio) - 0.3)).toBeLessThan(0.05);
    expect(Math.abs((a.phaseRad * 180) / Math.PI - 2)).toBeLessThan(0.2);
    expect(Math.hypot(a.dcI, a.dcQ)).toBeGreaterThan(0.015);
    expect(Math.abs(db20(b.gainRatio))).toBeLessThan(0.08);
    expect(Math.abs((b.phaseRad * 180) / Math.PI)).toBeLessThan(0.4);
    expect(Math.hypot(b.dcI, b.dcQ)).toBeLessThan(0.002);
  });
});

describe('playback caution', () => {
  test('says that radiating needs authorisation and that bench tests belong shielded or into a dummy load', () => {
    // DESIGN.md, Safety.
    expect(TRANSMIT_CAUTION).toMatch(/licen[cs]e or authori[sz]ation/);
    expect(TRANSMIT_CAUTION).toMatch(/spectrum rules/);
    expect(TRANSMIT_CAUTION).toMatch(/shielded/);
    expect(TRANSMIT_CAUTION).toMatch(/dummy load/);
  });
});
