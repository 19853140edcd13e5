// The readout catalogue must list exactly what the measure stage emits: specifications are
// validated against it, so a missing name would make a real readout impossible to put a limit on.
import { describe, expect, it } from 'vitest';
import { MEASUREMENTS } from '@/dsp/stages/measure';
import { READOUT_CATALOGUE, readoutEntry } from '@/dsp/measure/catalogue';
import { measure } from './measure-helpers';

function toneSignal(n: number, complex: boolean): Float32Array {
  const x = new Float32Array(n * (complex ? 2 : 1));
  for (let i = 0; i < n; i++) {
    const a = 0.5 * Math.cos(2 * Math.PI * 0.1 * i) + 0.3 * Math.cos(2 * Math.PI * 0.13 * i) + 1e-3 * Math.sin(i * 12.9898);
    if (complex) {
      x[2 * i] = a + 0.01;
      x[2 * i + 1] = 0.5 * Math.sin(2 * Math.PI * 0.1 * i) + 0.3 * Math.sin(2 * Math.PI * 0.13 * i);
    } else x[i] = a;
  }
  return x;
}

const params = { measurements: [...MEASUREMENTS], bandLow: 0.05e6, bandHigh: 0.15e6, symbolRate: 100e3, harmonics: 10 };

describe('readout catalogue', () => {
  for (const complex of [false, true]) {
    it(`lists every readout of a ${complex ? 'complex' : 'real'} stream with its unit`, () => {
      const readouts = measure(toneSignal(65536, complex), { sampleRate: 1e6, sampleType: complex ? 'complex' : 'real' }, params);
      const names = Object.keys(readouts);
      expect(names.length).toBeGreaterThan(20);
      for (const r of Object.values(readouts)) {
        const entry = readoutEntry(r.name);
        expect(entry, `${r.name} is in the catalogue`).toBeDefined();
        expect(r.unit, r.name).toBe(entry!.unit);
        if (entry!.complex !== undefined) expect(entry!.complex, r.name).toBe(complex);
      }
      // Every catalogue entry for this stream type was emitted (harmonics 2..10 included).
      const expected = READOUT_CATALOGUE.filter((e) => e.complex === undefined || e.complex === complex).map((e) => e.name);
      expect(names.sort()).toEqual(expected.sort());
    });
  }

  it('a calibrated level readout reads dBm while the catalogue keeps dBFS as its base unit', () => {
    const readouts = measure(toneSignal(16384, false), { sampleRate: 1e6, sampleType: 'real' }, { measurements: ['tone'], calibrationDb: 10 });
    expect(readouts['Tone level'].unit).toBe('dBm');
    expect(readoutEntry('Tone level')!.level).toBe(true);
  });
});
