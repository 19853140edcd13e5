/**
 * `quadrille inspect CAPTURE`: the capture's metadata and a quick readout from one pass over its
 * samples: duration, RMS and peak level (dBFS), DC offset per channel and the strongest tone.
 *
 * Levels: 0 dBFS is a power of 1.0 (full scale 1.0 on each component). For complex samples the
 * power is I^2 + Q^2, so a full-scale complex tone reads 0 dBFS RMS; for real samples it is x^2.
 * The peak level is 20 log10 of the largest |x| (|I + jQ| for complex).
 */
import { basename } from 'node:path';
import { WelchAccumulator } from '../dsp/spectral/welch';
import { ClippingCounter } from '../dsp/measure/clipping';
import type { Capture } from '../contracts/capture';
import { openCapture, type CaptureOptions } from './capture-source';

/** What `inspect` reports: the capture contract's format fields, then what the file holds. */
export type InspectReport = Pick<Capture, 'datatype' | 'layout' | 'sampleRate' | 'centerFrequency'> & {
  file: string;
  container: string;
  samples: number;
  /** Duration in seconds. */
  duration: number;
  /** RMS level in dBFS (per channel for real-pair). */
  rmsDbfs: number[];
  /** Peak level in dBFS (per channel for real-pair). */
  peakDbfs: number[];
  /** Mean of each component: [I, Q] for complex, [x] for real, [ch0, ch1] for real-pair. */
  dcOffset: number[];
  /** Samples with |x| >= 1 (at or beyond full scale) per channel, named as dcOffset. */
  clipped: number[];
  /** Crest factor 20 log10(peak / RMS) in dB per channel (one figure of |I + jQ| for complex); null without signal. */
  crestFactorDb: (number | null)[];
  /** Strongest spectral peak: frequency (Hz, relative to 0 Hz of the stream) and level (dBFS). */
  strongestTone: { frequency: number; level: number } | null;
  description?: string;
  author?: string;
  hw?: string;
  annotations?: number;
};

/** One pass over a capture: levels, DC and the strongest tone (Welch, Hann, up to 4096 points). */
export function inspectCapture(path: string, options: CaptureOptions = {}): InspectReport {
  const capture = openCapture(path, options);
  const { format } = capture;
  const layout = format.sampleType;
  const channels = layout === 'real' ? 1 : 2;
  const sum = new Float64Array(channels);
  const sumSquares = new Float64Array(channels);
  const peakSquare = new Float64Array(channels);
  // Fewer points than samples would leave Welch nothing to average: shrink the FFT for short captures.
  let fftSize = 4096;
  while (fftSize > 16 && fftSize > capture.totalSamples) fftSize /= 2;
  const welch = capture.totalSamples > 0 && layout !== 'real-pair'
    ? new WelchAccumulator({ sampleRate: format.sampleRate, sampleType: layout, fftSize, window: 'hann', overlap: 0.5, scaling: 'spectrum' })
    : null;
  // A real pair is two real channels, each with its own full scale and crest factor.
  const clipCounters = layout === 'real-pair' ? [new ClippingCounter(false), new ClippingCounter(false)] : [new ClippingCounter(layout === 'complex')];
  let samples = 0;
  for (const block of capture.blocks()) {
    if (layout === 'real-pair') {
      const half = block.length >> 1;
      const a = new Float32Array(half), b = new Float32Array(half);
      for (let k = 0; k < half; k++) { a[k] = block[2 * k]; b[k] = block[2 * k + 1]; }
      clipCounters[0].push(a);
      clipCounters[1].push(b);
    } else {
      clipCounters[0].push(block);
    }
    if (layout === 'complex') {
      let si = 0, sq = 0, p = 0, peak = peakSquare[0];
      for (let k = 0; k < block.length; k += 2) {
        const i = block[k], q = block[k + 1];
        si += i; sq += q;
        const m = i * i + q * q;
        p += m;
        if (m > peak) peak = m;
      }
      sum[0] += si; sum[1] += sq; sumSquares[0] += p; peakSquare[0] = peak;
    } else {
      for (let k = 0; k < block.length; k++) {
        const c = k % channels;
        const v = block[k];
        sum[c] += v;
        sumSquares[c] += v * v;
        if (v * v > peakSquare[c]) peakSquare[c] = v * v;
      }
    }
    welch?.push(block);
    samples += block.length / (layout === 'real' ? 1 : 2);
  }
  const db10 = (p: number) => (p > 0 ? 10 * Math.log10(p) : -Infinity);
  const levelChannels = layout === 'complex' ? 1 : channels;
  const rmsDbfs = Array.from({ length: levelChannels }, (_, c) => db10(samples ? sumSquares[c] / samples : 0));
  const peakDbfs = Array.from({ length: levelChannels }, (_, c) => db10(peakSquare[c]));
  let strongestTone: InspectReport['strongestTone'] = null;
  if (welch && samples > 0) {
    welch.finish();
    const result = welch.result();
    strongestTone = { frequency: result.peak.frequency, level: result.peak.level };
  }
  const g = capture.meta?.global;
  return {
    file: capture.path,
    container: capture.kind,
    datatype: capture.datatypeLabel,
    layout,
    sampleRate: format.sampleRate,
    centerFrequency: format.centerFrequency ?? null,
    samples,
    duration: samples / format.sampleRate,
    rmsDbfs,
    peakDbfs,
    dcOffset: Array.from(sum, (s) => (samples ? s / samples : 0)),
    clipped: clipCounters.flatMap((c) => c.clipped),
    crestFactorDb: clipCounters.map((c) => c.crestFactorDb()),
    strongestTone,
    ...(g?.description ? { description: g.description } : {}),
    ...(g?.author ? { author: g.author } : {}),
    ...(g?.hw ? { hw: g.hw } : {}),
    ...(capture.meta ? { annotations: capture.meta.annotations.length } : {}),
  };
}

/** The report as aligned text lines for people. */
export function formatInspectReport(r: InspectReport): string {
  const db = (v: number) => (Number.isFinite(v) ? `${v.toFixed(2)} dBFS` : '-inf dBFS');
  const names = r.layout === 'complex' ? ['I', 'Q'] : r.layout === 'real' ? ['x'] : ['ch0', 'ch1'];
  const perChannel = (values: number[]) => (values.length === 1 ? db(values[0]) : values.map((v, k) => `${names[k]} ${db(v)}`).join(', '));
  const lines: [string, string][] = [
    ['file', basename(r.file)],
    ['container', r.container],
    ['datatype', r.datatype],
    ['layout', r.layout],
    ['sample rate', `${r.sampleRate} Hz`],
    ['centre frequency', r.centerFrequency === null ? '(not given)' : `${r.centerFrequency} Hz`],
    ['samples', String(r.samples)],
    ['duration', `${r.duration.toPrecision(6)} s`],
    ['RMS level', perChannel(r.rmsDbfs)],
    ['peak level', perChannel(r.peakDbfs)],
    ['DC offset', r.dcOffset.map((v, k) => `${names[k]} ${v.toExponential(3)}`).join(', ')],
    ...r.clipped.map((count, k): [string, string] => {
      const crest = r.crestFactorDb[r.layout === 'complex' ? 0 : k];
      const crestText = crest === null || crest === undefined ? 'crest factor (no signal)' : `crest factor ${crest.toFixed(2)} dB${r.layout === 'complex' ? ' (of |I + jQ|)' : ''}`;
      return [`clipped ${names[k]}`, `${count} of ${r.samples} samples at or beyond full scale, ${crestText}`];
    }),
    ...(r.clipped.some((c) => c > 0) ? [['overload', 'WARNING: clipped samples; the levels above are unreliable'] as [string, string]] : []),
    ['strongest tone', r.strongestTone ? `${r.strongestTone.frequency.toFixed(1)} Hz at ${db(r.strongestTone.level)}` : r.layout === 'real-pair' ? '(not computed for real-pair; combine the channels first)' : '(no samples)'],
  ];
  if (r.description) lines.push(['description', r.description]);
  if (r.author) lines.push(['author', r.author]);
  if (r.hw) lines.push(['hardware', r.hw]);
  if (r.annotations !== undefined) lines.push(['annotations', String(r.annotations)]);
  const width = Math.max(...lines.map(([k]) => k.length));
  return lines.map(([k, v]) => `${k.padEnd(width)}  ${v}`).join('\n');
}
