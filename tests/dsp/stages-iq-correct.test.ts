/**
 * iq-correct on synthesized imbalanced tones: the image before correction sits at the level the
 * image-rejection formula predicts, and the correction removes it.
 */
import { describe, expect, it } from 'vitest';
import type { StreamFormat } from '@/dsp/types';
import { iqCorrectStage } from '@/dsp/stages/index';
import { estimateIqImbalance } from '@/dsp/measure/iq-imbalance';
import { dftAt, gaussianNoise, runStage } from './stages-helpers';

const fs = 1e6;
const f = 62_500; // 16 samples per cycle: whole cycles in every power-of-two length from 16 up
const N = 16_384;
const format: StreamFormat = { sampleRate: fs, sampleType: 'complex' };

/** A tone at +f through an imbalanced front end: I = g cos(theta) + dcI, Q = sin(theta + p) + dcQ. */
function imbalancedTone(gainDb: number, phaseDeg: number, dcI = 0, dcQ = 0): Float32Array {
  const g = Math.pow(10, gainDb / 20);
  const p = (phaseDeg * Math.PI) / 180;
  const out = new Float32Array(2 * N);
  for (let n = 0; n < N; n++) {
    const theta = (2 * Math.PI * f * n) / fs;
    out[2 * n] = g * Math.cos(theta) + dcI;
    out[2 * n + 1] = Math.sin(theta + p) + dcQ;
  }
  return out;
}

/** Wanted-to-image power ratio (dB) of a tone at +f: |X(+f)|^2 / |X(-f)|^2. */
function imageRejection(iq: Float32Array): number {
  return 20 * Math.log10(dftAt(iq, f, fs).magnitude / dftAt(iq, -f, fs).magnitude);
}

describe('image of an imbalanced tone before correction', () => {
  it.each([
    // B. Razavi, "RF Microelectronics", 2nd ed., 2012 (image-reject receivers); T. Lee, "The Design
    // of CMOS Radio-Frequency Integrated Circuits", 2nd ed., 2004: IRR = (1 + 2g cos t + g^2) /
    // (1 - 2g cos t + g^2); values from CHECKS.md.
    [0.5, 3, 28.2],
    [20 * Math.log10(1.01), 1, 39.96],
    [0.1, 0.5, 42.83],
    [0, 1, 41.18],
    [1, 0, 24.81],
  ])('%f dB and %f deg leave the image %f dB below the tone', (gainDb, phaseDeg, irrDb) => {
    expect(imageRejection(imbalancedTone(gainDb, phaseDeg))).toBeCloseTo(irrDb, 1);
  });

  it('0.5 dB and 3 deg: the exact form, not the small-error approximation (0.14 dB apart)', () => {
    // Razavi 2012 / Lee 2004 exact form gives 28.20 dB; 4 / (e^2 + t^2) would give about 28.06 dB.
    const measured = imageRejection(imbalancedTone(0.5, 3));
    expect(Math.abs(measured - 28.2)).toBeLessThan(0.01);
  });
});

describe('iq-correct', () => {
  it('blind mode restores image rejection and removes the DC offset (Ellingson 2003 correction)', () => {
    const impaired = imbalancedTone(0.5, 3, 0.05, -0.03);
    // The DC spur and the image are both there before.
    expect(dftAt(impaired, 0, fs).magnitude).toBeGreaterThan(0.05);
    expect(imageRejection(impaired)).toBeLessThan(29);
    const corrected = runStage(iqCorrectStage, { mode: 'blind', estimateSamples: 4096 }, format, [impaired]);
    expect(corrected.length).toBe(impaired.length);
    expect(imageRejection(corrected)).toBeGreaterThan(80);
    expect(dftAt(corrected, 0, fs).magnitude).toBeLessThan(1e-5);
    // Ellingson's correction scales to the Q channel's amplitude: the tone comes out at 1.
    expect(dftAt(corrected, f, fs).magnitude).toBeCloseTo(1, 4);
  });

  it('manual mode with the known imbalance restores image rejection', () => {
    const corrected = runStage(iqCorrectStage, { mode: 'manual', gainDb: 0.5, phaseDeg: 3 }, format, [imbalancedTone(0.5, 3)]);
    expect(imageRejection(corrected)).toBeGreaterThan(80);
  });

  it('manual mode with the wrong sign of phase makes the image worse, not better', () => {
    const corrected = runStage(iqCorrectStage, { mode: 'manual', gainDb: 0.5, phaseDeg: -3 }, format, [imbalancedTone(0.5, 3)]);
    expect(imageRejection(corrected)).toBeLessThan(28.2);
  });

  it('blind mode on noise-like I/Q brings the estimated imbalance to zero', () => {
    const samples = 200_000;
    const clean = gaussianNoise(2 * samples, 0.3, 11);
    const g = Math.pow(10, 0.3 / 20);
    const p = (2 * Math.PI) / 180;
    const impaired = new Float32Array(2 * samples);
    for (let n = 0; n < samples; n++) {
      // Same model as the tone: Q leads by p, I is g times larger.
      impaired[2 * n] = g * clean[2 * n];
      impaired[2 * n + 1] = Math.cos(p) * clean[2 * n + 1] + Math.sin(p) * clean[2 * n];
    }
    const before = estimateIqImbalance(impaired);
    expect(20 * Math.log10(before.gainRatio)).toBeCloseTo(0.3, 1);
    expect((before.phaseRad * 180) / Math.PI).toBeCloseTo(2, 0);
    const corrected = runStage(iqCorrectStage, { mode: 'blind', estimateSamples: samples }, format, [impaired]);
    const after = estimateIqImbalance(corrected);
    expect(Math.abs(20 * Math.log10(after.gainRatio))).toBeLessThan(1e-4);
    expect(Math.abs(after.phaseRad)).toBeLessThan(1e-5);
  });

  it('blind mode refuses a stream whose I and Q are the same signal', () => {
    const same = new Float32Array(2 * 1000);
    for (let n = 0; n < 1000; n++) same[2 * n] = same[2 * n + 1] = Math.cos(n / 3);
    expect(() => runStage(iqCorrectStage, { mode: 'blind', estimateSamples: 500 }, format, [same])).toThrow(/does not look like quadrature I\/Q/);
  });

  it('accepts complex input only and rejects out-of-range manual values', () => {
    expect(iqCorrectStage.accepts).toEqual(['complex']);
    expect(iqCorrectStage.schema.safeParse({ mode: 'manual', phaseDeg: 60 }).success).toBe(false);
    expect(iqCorrectStage.schema.parse({})).toEqual({ mode: 'blind', gainDb: 0, phaseDeg: 0, estimateSamples: 262_144 });
  });
});
