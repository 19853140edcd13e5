import { describe, expect, test } from 'vitest';
import { channelPower, dynamicRange, findTone, measureSpectrumOf, occupiedBandwidth } from '@/dsp/measure';
import { WelchAccumulator } from '@/dsp/spectral';
import { ifft } from '@/dsp/fft';
import { gaussian, seededRandom } from './spectral-fixtures';

/** A coherently sampled full-scale sine quantised by an ideal `bits`-bit ADC (full scale +/-1). */
function quantisedSine(n: number, cycles: number, bits: number): Float32Array {
  const q = 2 / 2 ** bits;
  const top = 2 ** (bits - 1) - 1;
  const x = new Float32Array(n);
  for (let k = 0; k < n; k++) {
    // Amplitude half a step below full scale so the peak code is not clipped.
    const v = (1 - q / 2) * Math.sin((2 * Math.PI * cycles * k) / n + 0.3);
    x[k] = Math.max(-top - 1, Math.min(top, Math.round(v / q))) * q;
  }
  return x;
}

describe('ideal ADC', () => {
  // W. Kester, "Taking the Mystery out of the Infamous Formula SNR = 6.02N + 1.76 dB", Analog
  // Devices MT-001: 12 bit 74.0 dB, 16 bit 98.1 dB. A prime number of cycles spreads the
  // quantisation error over many bins, as the tutorial's white-noise model assumes.
  test.each([
    [12, 74.0],
    [16, 98.1],
  ])('%i-bit quantised full-scale sine has SNR %f dB', (bits, snr) => {
    const n = 1 << 16;
    const x = quantisedSine(n, 4099, bits);
    const spectrum = measureSpectrumOf(x, { sampleRate: 1, sampleType: 'real', fftSize: n, window: 'blackman-harris' });
    const r = dynamicRange(spectrum);
    expect(Math.abs(r.snrDb - snr)).toBeLessThan(0.2);
    expect(Math.abs(r.sinadDb - snr)).toBeLessThan(0.2);
    expect(r.tone.frequency).toBeCloseTo(4099 / n, 9);
  });

  test('FFT processing gain: the noise floor per bin lies 10 log10(M/2) below the total noise', () => {
    // W. Kester, MT-001: processing gain 10 log10(M/2); M = 4096 gives 33.1 dB.
    const m = 4096;
    const x = quantisedSine(m, 601, 12);
    const welch = new WelchAccumulator({ sampleRate: 1, sampleType: 'real', fftSize: m, window: 'rectangular', scaling: 'spectrum' });
    welch.push(x);
    const p = welch.power();
    let floor = 0;
    let bins = 0;
    for (let k = 1; k < p.length; k++) {
      if (k === 601) continue;
      floor += p[k];
      bins++;
    }
    floor /= bins;
    const spectrum = measureSpectrumOf(x, { sampleRate: 1, sampleType: 'real', fftSize: m, window: 'rectangular' });
    const snr = dynamicRange(spectrum, { harmonics: 1 }).snrDb;
    const toneToFloor = 10 * Math.log10(p[601] / floor);
    expect(Math.abs(toneToFloor - snr - 33.1)).toBeLessThan(0.3);
  });
});

describe('tone, SNR, SINAD, SFDR', () => {
  const fs = 1e6;
  const n = 1 << 17;
  const normal = gaussian(seededRandom(17));

  test('an off-bin tone reads its true level and frequency', () => {
    // Common practice: main-lobe power / ENBW removes scalloping loss (up to 1.42 dB for Hann,
    // F. J. Harris, Proc. IEEE 66(1), 1978, Table 1).
    const f = 123_456.7;
    const a = 0.3;
    const x = new Float32Array(n).map((_, k) => a * Math.cos((2 * Math.PI * f * k) / fs));
    for (const window of ['hann', 'blackman-harris', 'flattop'] as const) {
      const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'real', fftSize: 4096, window });
      const tone = findTone(spectrum);
      // A real sine of amplitude A has power A^2/2 (scipy.signal.welch documentation, SciPy 1.17).
      expect(Math.abs(tone.levelDbfs - 10 * Math.log10((a * a) / 2))).toBeLessThan(0.02);
      expect(Math.abs(tone.frequency - f)).toBeLessThan(0.05 * (fs / 4096));
    }
  });

  test('tone in white noise: SNR from the known variances, SFDR and SINAD with a harmonic', () => {
    const a = 0.5;
    const sigma = 0.0005;
    const f = 100_000.3;
    const x = new Float32Array(n);
    for (let k = 0; k < n; k++) {
      const w = (2 * Math.PI * f * k) / fs;
      // Third harmonic at -50 dBc.
      x[k] = a * Math.sin(w) + a * 10 ** (-50 / 20) * Math.sin(3 * w) + sigma * normal() + 0.01;
    }
    const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'real', fftSize: 8192 });
    const r = dynamicRange(spectrum);
    const snr = 10 * Math.log10((a * a) / 2 / (sigma * sigma));
    expect(Math.abs(r.snrDb - snr)).toBeLessThan(0.15);
    // SINAD adds the harmonic's power to the noise.
    const harmonic = (a * 10 ** (-50 / 20)) ** 2 / 2;
    const sinad = 10 * Math.log10((a * a) / 2 / (sigma * sigma + harmonic));
    expect(Math.abs(r.sinadDb - sinad)).toBeLessThan(0.15);
    // The harmonic is the highest spur. f is 0.2 bin off a bin centre and 3f 0.4 bin, so peak bins
    // would scallop apart by up to 0.83 dB (Blackman-Harris, F. J. Harris, Proc. IEEE 66(1), 1978,
    // Table 1); SFDR from main-lobe power does not (common practice), leaving the noise in the lobe.
    expect(Math.abs(r.sfdrDb - 50)).toBeLessThan(0.05);
    // dBFS: a full-scale real sine (power 0.5) over the spur.
    expect(Math.abs(r.sfdrDbfs - 10 * Math.log10(0.5 / harmonic))).toBeLessThan(0.05);
    expect(r.sinadDb).toBeLessThan(r.snrDb - 5);
    // DC (0.01) is left out: neither the tone nor a spur.
    expect(Math.abs(r.tone.frequency - f)).toBeLessThan(5);
  });

  test('complex tone: SFDR against a -80 dBc spur on its own bin', () => {
    const fftSize = 4096;
    const bin = fs / fftSize;
    const x = new Float32Array(2 * n);
    for (let k = 0; k < n; k++) {
      const w1 = (2 * Math.PI * 300 * bin * k) / fs;
      const w2 = (2 * Math.PI * -700 * bin * k) / fs;
      const s = 10 ** (-80 / 20);
      x[2 * k] = 0.7 * Math.cos(w1) + 0.7 * s * Math.cos(w2);
      x[2 * k + 1] = 0.7 * Math.sin(w1) + 0.7 * s * Math.sin(w2);
    }
    const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'complex', fftSize });
    const r = dynamicRange(spectrum);
    expect(r.sfdrDb).toBeCloseTo(80, 1);
    expect(r.tone.frequency).toBeCloseTo(300 * bin, 3);
    expect(r.tone.levelDbfs).toBeCloseTo(20 * Math.log10(0.7), 3);
  });
});

describe('channel power and occupied bandwidth', () => {
  const fs = 2e6;
  const normal = gaussian(seededRandom(99));

  test('channel power of complex white noise is variance x band / fs', () => {
    // scipy.signal.welch documentation (SciPy 1.17): complex white noise of variance s^2 has density s^2/fs.
    const s = 0.2;
    const n = 1 << 18;
    const x = new Float32Array(2 * n).map(() => (s / Math.SQRT2) * normal());
    const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'complex', fftSize: 1024 });
    const p = channelPower(spectrum, -fs / 4, fs / 4 - fs / 1024);
    expect(10 * Math.log10(p / ((s * s) / 2))).toBeCloseTo(0, 1);
    expect(() => channelPower(spectrum, 10, 5)).toThrow(/bandHigh: must be above bandLow/);
  });

  test('99 % occupied bandwidth of a flat band is 0.99 of its width', () => {
    // Common practice: 99 % of the power of a flat band of width B lies in 0.99 B around its centre.
    // Flat band from -200 kHz to +300 kHz: equal-magnitude DFT bins with random phases, inverse
    // transformed (a periodic signal, so every Welch segment sees the same flat band).
    const n = 1 << 16;
    const random = seededRandom(5);
    const bins = new Float64Array(2 * n);
    for (let k = 0; k < n; k++) {
      const f = (k < n / 2 ? k : k - n) * (fs / n);
      if (f < -200_000 || f > 300_000) continue;
      const ph = 2 * Math.PI * random();
      bins[2 * k] = Math.cos(ph);
      bins[2 * k + 1] = Math.sin(ph);
    }
    const x = Float32Array.from(ifft(bins));
    const spectrum = measureSpectrumOf(x, { sampleRate: fs, sampleType: 'complex', fftSize: 8192 });
    const obw = occupiedBandwidth(spectrum);
    expect(obw.bandwidthHz / (0.99 * 500_000)).toBeCloseTo(1, 2);
    expect((obw.lowHz + obw.highHz) / 2).toBeCloseTo(50_000, -3);
  });
});
