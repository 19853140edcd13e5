/**
 * The quick look's analysis of a capture head: decoded bytes reach the engine's spectrum and
 * balance estimate in the right layout, and the figures shown agree with the published formulas.
 */
import { describe, expect, it } from 'vitest';
import { analyseHead, clippingWarning } from '@/components/captures/quicklook-analysis';

const fs = 4e6;
const n = 2 ** 16;
const toneHz = 600e3;

/** Interleaved I/Q of a complex tone with a gain ratio g (I over Q) and Q phase error p (rad), plus DC. */
function impairedTone(g: number, p: number, dcI: number, dcQ: number): Float32Array {
  const out = new Float32Array(2 * n);
  const a = 0.5;
  for (let k = 0; k < n; k++) {
    const phase = (2 * Math.PI * toneHz * k) / fs;
    const i = a * Math.cos(phase);
    const q = a * Math.sin(phase);
    // Q' = Q cos p + I sin p (the synthesizer's phase-error model), gain split evenly on I and Q.
    out[2 * k] = i * Math.sqrt(g) + dcI;
    out[2 * k + 1] = ((q * Math.cos(p) + i * Math.sin(p)) / Math.sqrt(g)) + dcQ;
  }
  return out;
}

function bytesOf(values: Float32Array): ArrayBuffer {
  return values.buffer.slice(0) as ArrayBuffer;
}

function ci16(values: Float32Array): ArrayBuffer {
  const out = new Int16Array(values.length);
  for (let k = 0; k < values.length; k++) out[k] = Math.max(-32768, Math.min(32767, Math.round(values[k] * 32768)));
  return out.buffer;
}

describe('quick-look analysis of a capture head', () => {
  const gainDb = 0.5;
  const phaseDeg = 3;
  const values = impairedTone(10 ** (gainDb / 20), (phaseDeg * Math.PI) / 180, 0.02, -0.01);

  it('finds the tone and reports the balance of a complex head', () => {
    const result = analyseHead({ bytes: bytesOf(values), datatype: 'cf32_le', layout: 'complex', sampleRate: fs });
    expect(result.samples).toBe(n);
    expect(result.sampleType).toBe('complex');
    // Tone frequency within one bin of the spectrum (Welch resolution fs / fftSize).
    expect(Math.abs(result.spectrum.peak.frequency - toneHz)).toBeLessThan(fs / result.spectrumFftSize);
    // Blind estimate: S. W. Ellingson, "Correcting I-Q Imbalance in Direct Conversion Receivers", 2003.
    expect(result.balance.gainImbalanceDb!).toBeCloseTo(gainDb, 2);
    expect(result.balance.phaseImbalanceDeg!).toBeCloseTo(phaseDeg, 1);
    // 0.5 dB and 3 deg imply 28.20 dB: B. Razavi, "RF Microelectronics", 2nd ed., 2012 (CHECKS.md).
    expect(result.balance.imageRejectionDb!).toBeCloseTo(28.2, 1);
    // DC level 20 log10 |mean|: 0.02 of full scale is -33.98 dBFS (common practice).
    expect(result.balance.dcIDbfs).toBeCloseTo(20 * Math.log10(0.02), 1);
    expect(result.balance.dcQDbfs!).toBeCloseTo(20 * Math.log10(0.01), 1);
    expect(result.spectrum.frequencies.length).toBeLessThanOrEqual(2048);
    expect(result.trace.channels).toHaveLength(2);
    expect(result.spectrogram.levels.length).toBeLessThanOrEqual(256);
  });

  it('reads two real channels as I + jQ and integer samples at full scale 1.0', () => {
    const complex = analyseHead({ bytes: bytesOf(values), datatype: 'cf32_le', layout: 'complex', sampleRate: fs });
    const pair = analyseHead({ bytes: ci16(values), datatype: 'ri16_le', layout: 'real-pair', sampleRate: fs });
    expect(pair.samples).toBe(n);
    expect(pair.balance.gainImbalanceDb!).toBeCloseTo(complex.balance.gainImbalanceDb!, 2);
    expect(pair.balance.phaseImbalanceDeg!).toBeCloseTo(complex.balance.phaseImbalanceDeg!, 1);
    expect(pair.spectrum.peak.level).toBeCloseTo(complex.spectrum.peak.level, 1);
  });

  it('reports only DC for a real head and puts a real tone on a one-sided axis', () => {
    const real = new Float32Array(n);
    for (let k = 0; k < n; k++) real[k] = 0.5 * Math.cos((2 * Math.PI * toneHz * k) / fs) + 0.01;
    const result = analyseHead({ bytes: bytesOf(real), datatype: 'rf32_le', layout: 'real', sampleRate: fs });
    expect(result.sampleType).toBe('real');
    expect(result.spectrum.frequencies[0]).toBe(0);
    expect(Math.abs(result.spectrum.peak.frequency - toneHz)).toBeLessThan(fs / result.spectrumFftSize);
    expect(result.balance.gainImbalanceDb).toBeNull();
    expect(result.balance.dcIDbfs).toBeCloseTo(-40, 1);
    expect(result.trace.channels).toHaveLength(1);
  });

  it('names the field of a bad datatype and refuses a head of fewer than two samples', () => {
    expect(() => analyseHead({ bytes: new ArrayBuffer(16), datatype: 'cf33_le', layout: 'complex', sampleRate: fs })).toThrow(/datatype/);
    expect(() => analyseHead({ bytes: new ArrayBuffer(8), datatype: 'cf32_le', layout: 'complex', sampleRate: fs })).toThrow(/too few/);
  });

  it('counts samples at or beyond full scale per channel and warns that levels are then unreliable', () => {
    // Hand-made pattern of 8 I/Q samples, tiled 128 times: |I| >= 1 at 1.2, -1, -2 (3 per tile),
    // |Q| >= 1 at 1, -1.5 (2 per tile); 0.99 stays below full scale.
    const pattern = [[1.2, 0], [0.5, 1], [-1, 0], [0.3, 0], [0.99, 0], [-2, 0], [0, -1.5], [0.1, 0]];
    const tiles = 128;
    const iq = new Float32Array(2 * pattern.length * tiles);
    for (let t = 0; t < tiles; t++) pattern.forEach(([i, q], k) => { iq[2 * (t * 8 + k)] = i; iq[2 * (t * 8 + k) + 1] = q; });
    const result = analyseHead({ bytes: bytesOf(iq), datatype: 'cf32_le', layout: 'complex', sampleRate: fs });
    expect(result.clipping.clipped).toEqual([3 * tiles, 2 * tiles]);
    // Crest factor 10 log10(peak^2 / mean |I + jQ|^2): peak^2 = 4 (the -2 sample); per tile the
    // squared magnitudes sum to 1.44 + 1.25 + 1 + 0.09 + 0.9801 + 4 + 2.25 + 0.01 = 11.0201.
    expect(result.clipping.crestFactorDb!).toBeCloseTo(10 * Math.log10(4 / (11.0201 / 8)), 4);
    const warning = clippingWarning(result.clipping, result.sampleType, result.samples)!;
    expect(warning).toMatch(/I 384 of 1,024, Q 256 of 1,024/);
    expect(warning).toMatch(/unreliable/);

    // A clean head: no count, no warning.
    const clean = analyseHead({ bytes: bytesOf(values), datatype: 'cf32_le', layout: 'complex', sampleRate: fs });
    expect(clean.clipping.clipped).toEqual([0, 0]);
    expect(clippingWarning(clean.clipping, clean.sampleType, clean.samples)).toBeNull();

    // Real head: one channel; -32768 of an int16 is exactly -1.0 (at full scale), +32767 is below it.
    const int16 = new Int16Array(256);
    int16[3] = -32768; int16[10] = 32767; int16[20] = -32768;
    const real = analyseHead({ bytes: int16.buffer, datatype: 'ri16_le', layout: 'real', sampleRate: fs });
    expect(real.clipping.clipped).toEqual([2]);
  });
});
