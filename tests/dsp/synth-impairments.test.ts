import { describe, expect, test } from 'vitest';
import { estimateIqImbalance } from '@/dsp/measure/iq-imbalance';
import { createSynthesizer, synthesize } from '@/dsp/synth';
import { db10, db20, dftAt } from './synth-helpers';

const FS = 1_000_000;
const N = 65_536;
const BIN = FS / N;

/** Wanted-to-image ratio (dB) of a complex tone at +f measured at +f and -f. */
function measuredImageRejection(gainImbalance: number, phaseImbalance: number): number {
  const f = 2_000 * BIN;
  const x = synthesize({
    sampleRate: FS,
    duration: N / FS,
    tones: [{ frequency: f, level: -6 }],
    noise: { mode: 'off' },
    impairments: { gainImbalance, phaseImbalance },
  });
  const wanted = dftAt(x, 'complex', FS, f);
  const image = dftAt(x, 'complex', FS, -f);
  return db20(Math.hypot(wanted.re, wanted.im) / Math.hypot(image.re, image.im));
}

describe('I/Q imbalance leaves the image the image-rejection formula predicts', () => {
  // Exact IRR = (1 + 2 g cos t + g^2) / (1 - 2 g cos t + g^2): B. Razavi, "RF Microelectronics",
  // 2nd ed., 2012 (image-reject receivers); T. Lee, "The Design of CMOS Radio-Frequency Integrated
  // Circuits", 2nd ed., 2004. Values from CHECKS.md.
  test.each([
    ['0.5 dB and 3 deg', 0.5, 3, 28.2],
    ['1 dB alone', 1, 0, 24.81],
    ['1 deg alone', 0, 1, 41.18],
    ['1 % (0.0864 dB) and 1 deg', db20(1.01), 1, 39.96],
    ['0.1 dB and 0.5 deg', 0.1, 0.5, 42.83],
  ])('%s -> %f dB', (_label, gainDb, phaseDeg, expected) => {
    expect(Math.abs(measuredImageRejection(gainDb, phaseDeg) - expected)).toBeLessThan(0.2);
  });

  test('negative gain and phase errors give the same rejection (the formula is even in both)', () => {
    // The IRR formula depends on g only through g + 1/g and on t through cos t (Razavi 2012).
    expect(Math.abs(measuredImageRejection(-0.5, -3) - 28.2)).toBeLessThan(0.2);
  });

  test('the blind estimate reads back the synthesized gain ratio and phase', () => {
    const x = synthesize({
      sampleRate: FS,
      duration: (16 * N) / FS,
      tones: [],
      noise: { mode: 'total', level: -20 },
      impairments: { gainImbalance: 0.3, phaseImbalance: 2, dcOffsetI: 0.02, dcOffsetQ: -0.01 },
    });
    const estimate = estimateIqImbalance(x);
    // Ellingson's estimator (S. W. Ellingson, "Correcting I-Q Imbalance in Direct Conversion
    // Receivers", 2003) inverts exactly this model: I' = a I, Q' = Q cos p + I sin p, up to a common gain.
    // Over 2^20 noise samples the estimates scatter by about 0.009 dB and 0.06 deg (one sigma).
    expect(Math.abs(db20(estimate.gainRatio) - 0.3)).toBeLessThan(0.03);
    expect(Math.abs((estimate.phaseRad * 180) / Math.PI - 2)).toBeLessThan(0.2);
    expect(estimate.dcI).toBeCloseTo(0.02, 3);
    expect(estimate.dcQ).toBeCloseTo(-0.01, 3);
  });
});

describe('DC offset and layouts', () => {
  test('a DC offset shows at 0 Hz with the level of |dcI + j dcQ|', () => {
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      tones: [{ frequency: 3_000 * BIN, level: -6 }],
      noise: { mode: 'total', level: -70 },
      impairments: { dcOffsetI: 0.01, dcOffsetQ: -0.02 },
    });
    const dc = dftAt(x, 'complex', FS, 0);
    // A DC offset in I or Q is a spur at 0 Hz after combining (CHECKS.md, common practice).
    expect(dc.re).toBeCloseTo(0.01, 3);
    expect(dc.im).toBeCloseTo(-0.02, 3);
    expect(Math.abs(db20(Math.hypot(dc.re, dc.im)) - db20(Math.hypot(0.01, 0.02)))).toBeLessThan(0.1);
  });

  test('a real capture takes its DC offset on the one channel', () => {
    const x = synthesize({
      sampleRate: FS,
      duration: N / FS,
      datatype: 'rf32_le',
      layout: 'real',
      tones: [{ frequency: 3_000 * BIN, level: -6 }],
      noise: { mode: 'off' },
      impairments: { dcOffsetI: -0.05 },
    });
    expect(dftAt(x, 'real', FS, 0).re).toBeCloseTo(-0.05, 5);
  });

  test('a real-pair capture holds the same I and Q values as the complex capture of the same spec', () => {
    const spec = {
      sampleRate: FS,
      duration: 0.02,
      tones: [{ frequency: 12_345, level: -10 }],
      carriers: [{ modulation: 'qpsk', frequency: -150_000, level: -15, symbolRate: 50_000 }],
      noise: { mode: 'total', level: -50 },
      impairments: { gainImbalance: 0.4, phaseImbalance: -1.5, dcOffsetI: 0.01, adcBits: 12 },
      seed: 9,
    } as const;
    const complex = synthesize({ ...spec, datatype: 'ci16_le', layout: 'complex' });
    const pair = synthesize({ ...spec, datatype: 'ri16_le', layout: 'real-pair' });
    // Two real ADC channels are the I and Q of the complex baseband (DESIGN.md, channel layouts).
    expect(Buffer.from(pair.buffer).equals(Buffer.from(complex.buffer))).toBe(true);
  });
});

describe('ADC quantisation and clipping', () => {
  /** SNR (dB) of an N-bit quantised full-scale sine against the same sine unquantised. */
  function quantisationSnr(bits: number): number {
    const lsb = 2 ** -(bits - 1);
    const spec = {
      sampleRate: FS,
      duration: (4 * N) / FS,
      datatype: 'rf64_le',
      layout: 'real',
      // Frequency an irrational fraction of fs ((sqrt 5 - 1) / 8, far from any short period) so the
      // quantisation error spreads like noise; amplitude one step below full scale so no code clips.
      tones: [{ frequency: (FS * (Math.sqrt(5) - 1)) / 8, level: db20(1 - lsb) }],
      noise: { mode: 'off' },
    } as const;
    const ideal = synthesize(spec);
    const quantised = synthesize({ ...spec, impairments: { adcBits: bits } });
    let signal = 0;
    let error = 0;
    for (let k = 0; k < ideal.length; k++) {
      signal += ideal[k] * ideal[k];
      const e = quantised[k] - ideal[k];
      error += e * e;
    }
    return db10(signal / error);
  }

  test.each([8, 12, 16])('%i bits: SNR near 6.02 N + 1.76 dB', (bits) => {
    // W. Kester, "Taking the Mystery out of the Infamous Formula SNR = 6.02N + 1.76 dB", Analog
    // Devices MT-001: 12 bit 74.0 dB, 16 bit 98.1 dB for a full-scale sine (less 20 log10(1 - lsb) here).
    const lsb = 2 ** -(bits - 1);
    const expected = 6.02 * bits + 1.76 + db20(1 - lsb);
    expect(Math.abs(quantisationSnr(bits) - expected)).toBeLessThan(0.3);
  });

  test('quantised values sit on the N-bit grid', () => {
    const x = synthesize({ sampleRate: FS, duration: 0.01, tones: [{ frequency: 1_000, level: -3 }], noise: { mode: 'total', level: -40 }, impairments: { adcBits: 10 } });
    // Step 2^-(N-1) of the engine's full-scale convention (src/dsp/formats/full-scale.ts; common practice).
    for (const v of x) expect(Number.isInteger(v * 512)).toBe(true);
  });

  test('clipping saturates at full scale (largest code with an ADC) and is counted', () => {
    const hot = { sampleRate: FS, duration: 0.01, datatype: 'rf32_le', layout: 'real', tones: [{ frequency: 1_000, level: 6 }], noise: { mode: 'off' } } as const;
    const withAdc = createSynthesizer({ ...hot, impairments: { adcBits: 8 } });
    const a = withAdc.next(10_000)!;
    expect(Math.max(...a)).toBe(127 / 128);
    expect(Math.min(...a)).toBe(-1);
    expect(withAdc.clippedValues).toBeGreaterThan(1000);
    expect(withAdc.warnings.map((w) => w.code)).toContain('may-clip');
    const floatClip = synthesize(hot);
    expect(Math.max(...floatClip)).toBe(1);
    const noClip = synthesize({ ...hot, impairments: { clip: false } });
    // A +6 dBFS sine has peak 10^(6/20) = 1.995 (definition of dBFS).
    expect(Math.max(...noClip)).toBeCloseTo(10 ** (6 / 20), 3);
  });
});
