/**
 * Micro-benchmark of the polyphase FIR decimator in the benchmark chain's shape: 127-tap Hamming
 * low-pass, complex float32 input, factor 8, blocks of 65536 samples. Not a test (timings vary
 * with load); run it alone:  node --import tsx tests/dsp/filters-decimator.bench.ts
 */
import { FirDecimator, FirFilter, BiquadCascade, designIir, windowedSincTaps } from '../../src/dsp/filters/index';

const BLOCK = 65536;
const taps = windowedSincTaps({ response: 'lowpass', taps: 127, window: 'hamming', cutoff: 400e3, sampleRate: 10e6 });
const input = Float32Array.from({ length: 2 * BLOCK }, () => Math.random() * 2 - 1);

// Wall time per block suffers when other processes share the cores: report the best block and
// the rate per CPU second of this process as well as the plain mean.
function measure(name: string, processor: { process(b: Float32Array): Float32Array }, seconds = 2): void {
  for (let i = 0; i < 20; i++) processor.process(input);
  let blocks = 0;
  let best = Infinity;
  const cpu0 = process.cpuUsage();
  const start = performance.now();
  while (performance.now() - start < seconds * 1000) {
    const t0 = performance.now();
    processor.process(input);
    best = Math.min(best, performance.now() - t0);
    blocks++;
  }
  const mean = (performance.now() - start) / blocks;
  const cpu = process.cpuUsage(cpu0);
  const cpuMs = (cpu.user + cpu.system) / 1000 / blocks;
  const rate = (ms: number) => (BLOCK / (ms / 1000) / 1e6).toFixed(1);
  console.log(`${name.padEnd(48)} Msamples/s of input: best block ${rate(best)}, per CPU time ${rate(cpuMs)}, wall mean ${rate(mean)}`);
}

measure('polyphase decimator, 127 taps, /8, complex', new FirDecimator(taps, 8, 2));
measure('polyphase decimator, 127 taps, /8, real', new FirDecimator(taps, 8, 1));
measure('FIR filter, 127 taps, complex (full rate)', new FirFilter(taps, 2));
measure('biquad cascade, 8th-order Butterworth, complex', new BiquadCascade(designIir({ family: 'butterworth', response: 'lowpass', order: 8, cutoff: 400e3, sampleRate: 10e6 }), 2));
