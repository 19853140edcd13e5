/**
 * Spectral orientation of quadrature-mix and quadrature-combine, the mix frequency shift, and the
 * NCO's phase accuracy over a long stream.
 */
import { describe, expect, it } from 'vitest';
import type { StreamFormat } from '@/dsp/types';
import { mixStage, quadratureCombineStage, quadratureMixStage } from '@/dsp/stages/index';
import { complexTone, dftAt, dftRealAt, realTone, runStage } from './stages-helpers';

const fs = 1e6;
const fLo = 200e3;
const fIf = 25e3;
// 4000 samples hold whole cycles of every component (25 kHz, 200 kHz, 225 kHz, 425 kHz): no leakage.
const N = 4000;
const real: StreamFormat = { sampleRate: fs, sampleType: 'real' };

describe('quadrature-mix sign convention', () => {
  const x = realTone(N, fLo + fIf, fs);

  it('I - jQ (I = x cos, Q = x sin) puts a tone at f_LO + f_IF at +f_IF', () => {
    // Common practice (CHECKS.md, facts of the trade): I - jQ keeps the spectrum upright.
    const y = runStage(quadratureMixStage, { loFrequency: fLo, convention: 'i-minus-jq' }, real, [x]);
    expect(y.length).toBe(2 * N);
    expect(dftAt(y, fIf, fs).magnitude).toBeCloseTo(0.5, 5);
    expect(dftAt(y, -fIf, fs).magnitude).toBeLessThan(1e-5);
    // The sum-frequency term, x e^{-j w_LO t} at -(2 f_LO + f_IF), stays until a low-pass removes it.
    expect(dftAt(y, -(2 * fLo + fIf), fs).magnitude).toBeCloseTo(0.5, 5);
  });

  it('I + jQ puts the same tone at -f_IF', () => {
    // Common practice (CHECKS.md, facts of the trade): I + jQ inverts the spectrum.
    const y = runStage(quadratureMixStage, { loFrequency: fLo, convention: 'i-plus-jq' }, real, [x]);
    expect(dftAt(y, -fIf, fs).magnitude).toBeCloseTo(0.5, 5);
    expect(dftAt(y, fIf, fs).magnitude).toBeLessThan(1e-5);
  });

  it('the I and Q channels really are x cos and x sin of the LO', () => {
    const y = runStage(quadratureMixStage, { loFrequency: fLo, phase: 0, convention: 'i-plus-jq' }, real, [x]);
    for (const n of [0, 1, 17, 3999]) {
      const lo = (2 * Math.PI * fLo * n) / fs;
      expect(y[2 * n]).toBeCloseTo(x[n] * Math.cos(lo), 6);
      expect(y[2 * n + 1]).toBeCloseTo(x[n] * Math.sin(lo), 6);
    }
  });

  it('propagates real -> complex at the same rate and moves the centre frequency to the LO', () => {
    const { output, issues } = quadratureMixStage.propagate(quadratureMixStage.schema.parse({ loFrequency: 10.7e6 }), {
      sampleRate: 40e6,
      sampleType: 'real',
      centerFrequency: 0,
    });
    expect(output).toEqual({ sampleRate: 40e6, sampleType: 'complex', centerFrequency: 10.7e6 });
    expect(issues).toEqual([]);
    const above = quadratureMixStage.propagate(quadratureMixStage.schema.parse({ loFrequency: 30e6 }), { sampleRate: 40e6, sampleType: 'real' });
    expect(above.issues.map((i) => i.code)).toEqual(['frequency-above-nyquist']);
  });
});

describe('quadrature-combine sign convention', () => {
  // An analogue quadrature down-converter: I = x cos(w_LO t), Q = x sin(w_LO t), sampled by a dual ADC.
  const x = realTone(N, fLo + fIf, fs);
  const pair = new Float32Array(2 * N);
  const iChannel = new Float32Array(N);
  for (let n = 0; n < N; n++) {
    const lo = (2 * Math.PI * fLo * n) / fs;
    pair[2 * n] = iChannel[n] = x[n] * Math.cos(lo);
    pair[2 * n + 1] = x[n] * Math.sin(lo);
  }
  const format: StreamFormat = { sampleRate: fs, sampleType: 'real-pair' };

  it('I - jQ puts the tone at +f_IF with twice the amplitude of each channel term; I + jQ at -f_IF', () => {
    // Common practice (CHECKS.md, facts of the trade): the -f_IF components of I and jQ cancel and
    // the +f_IF ones add, so the complex tone is twice each channel's complex component.
    const minus = runStage(quadratureCombineStage, { convention: 'i-minus-jq' }, format, [pair]);
    const channelTerm = dftRealAt(iChannel, fIf, fs);
    expect(channelTerm).toBeCloseTo(0.25, 5);
    expect(dftAt(minus, fIf, fs).magnitude).toBeCloseTo(2 * channelTerm, 5);
    expect(dftAt(minus, -fIf, fs).magnitude).toBeLessThan(1e-5);

    const plus = runStage(quadratureCombineStage, { convention: 'i-plus-jq' }, format, [pair]);
    expect(dftAt(plus, -fIf, fs).magnitude).toBeCloseTo(0.5, 5);
    expect(dftAt(plus, fIf, fs).magnitude).toBeLessThan(1e-5);
  });

  it('swap exchanges the channels: Q + jI = j (I - jQ) is upright again', () => {
    const swapped = runStage(quadratureCombineStage, { convention: 'i-plus-jq', swap: true }, format, [pair]);
    expect(swapped[0]).toBe(pair[1]);
    expect(swapped[1]).toBe(pair[0]);
    expect(dftAt(swapped, fIf, fs).magnitude).toBeCloseTo(0.5, 5);
    expect(dftAt(swapped, -fIf, fs).magnitude).toBeLessThan(1e-5);
  });

  it('accepts only two real channels and outputs complex', () => {
    expect(quadratureCombineStage.accepts).toEqual(['real-pair']);
    const { output } = quadratureCombineStage.propagate(quadratureCombineStage.schema.parse({}), { ...format, bandLimit: 1e5 });
    expect(output).toEqual({ sampleRate: fs, sampleType: 'complex', bandLimit: 1e5 });
  });
});

describe('mix', () => {
  const rate = 10e6;
  const format: StreamFormat = { sampleRate: rate, sampleType: 'complex', centerFrequency: 2.4e9 };

  it('a shift of -1.25 MHz moves a tone at +1.25 MHz to 0 Hz', () => {
    const x = complexTone(8000, 1.25e6, rate, 0.5);
    const y = runStage(mixStage, { frequency: -1.25e6 }, format, [x]);
    expect(dftAt(y, 0, rate).magnitude).toBeCloseTo(0.5, 5);
    expect(dftAt(y, 1.25e6, rate).magnitude).toBeLessThan(1e-5);
    for (let n = 0; n < 8000; n += 997) {
      expect(y[2 * n]).toBeCloseTo(0.5, 6);
      expect(y[2 * n + 1]).toBeCloseTo(0, 6);
    }
  });

  it('a positive shift moves a tone up and the initial phase rotates it', () => {
    const x = complexTone(8000, -600e3, rate);
    const y = runStage(mixStage, { frequency: 1.6e6, phase: 90 }, format, [x]);
    const bin = dftAt(y, 1e6, rate);
    expect(bin.magnitude).toBeCloseTo(1, 5);
    expect(Math.atan2(bin.im, bin.re)).toBeCloseTo(Math.PI / 2, 5);
  });

  it('moves the centre frequency by the shift and warns beyond Nyquist', () => {
    const { output, issues } = mixStage.propagate(mixStage.schema.parse({ frequency: -1.25e6 }), format);
    // The tone at RF 2.4 GHz + 1.25 MHz now sits at 0 Hz.
    expect(output.centerFrequency).toBe(2.4e9 + 1.25e6);
    expect(issues).toEqual([]);
    const beyond = mixStage.propagate(mixStage.schema.parse({ frequency: 6e6 }), format);
    expect(beyond.issues[0]).toMatchObject({ code: 'frequency-above-nyquist', field: 'frequency', severity: 'warning' });
    expect(beyond.issues[0].message).toContain('-4000000 Hz');
  });
});

/** Exact phase in cycles, frac(n f / fs + phase / 2 pi) of the float64 values as given, by BigInt. */
function exactCycles(n: number, frequency: number, sampleRate: number): number {
  const exact = (x: number): [bigint, bigint] => {
    // x = mantissa * 2^exponent exactly, with a 53-bit integer mantissa.
    let exponent = 0;
    let m = x;
    while (!Number.isInteger(m)) {
      m *= 2;
      exponent -= 1;
    }
    return exponent === 0 ? [BigInt(m), 1n] : [BigInt(m), 1n << BigInt(-exponent)];
  };
  const [fNum, fDen] = exact(frequency);
  const [sNum, sDen] = exact(sampleRate);
  // n f / fs = n fNum sDen / (fDen sNum)
  const num = BigInt(n) * fNum * sDen;
  const den = fDen * sNum;
  let remainder = num % den;
  if (remainder < 0n) remainder += den;
  const scale = 1n << 60n;
  return Number((remainder * scale) / den) / Number(scale);
}

describe('NCO phase over 2^27 samples', () => {
  const total = 2 ** 27;
  const blockSamples = 2 ** 16;

  it.each([
    ['integer frequency (exact counter)', 1_234_567, 10e6],
    ['frequency with a short period (16000-sample table)', 1_250_625, 10e6],
    ['non-integer frequency and rate (float64 chunk phase)', 1234.5678901, 1e6 / 3],
  ])('%s: the last samples match cos/sin of the exact phase', (_name, frequency, sampleRate) => {
    const phaseDeg = 33;
    const processor = mixStage.create(mixStage.schema.parse({ frequency, phase: phaseDeg }), { sampleRate, sampleType: 'complex' });
    const ones = new Float32Array(2 * blockSamples);
    for (let n = 0; n < blockSamples; n++) ones[2 * n] = 1;
    let last: Float32Array = new Float32Array(0);
    for (let start = 0; start < total; start += blockSamples) last = processor.process(ones);
    const firstOfLast = total - blockSamples;
    let worst = 0;
    for (let k = blockSamples - 512; k < blockSamples; k++) {
      const n = firstOfLast + k;
      const angle = 2 * Math.PI * exactCycles(n, frequency, sampleRate) + (phaseDeg * Math.PI) / 180;
      worst = Math.max(worst, Math.abs(last[2 * k] - Math.cos(angle)), Math.abs(last[2 * k + 1] - Math.sin(angle)));
    }
    // Float32 output rounds to about 6e-8; a float32 phase accumulator would be off by far more.
    expect(worst).toBeLessThan(2e-7);
    // Amplitude must not drift either (a recursive rotator without renormalisation would).
    const n = blockSamples - 1;
    expect(Math.hypot(last[2 * n], last[2 * n + 1])).toBeCloseTo(1, 6);
  }, 60_000);
});
