/**
 * From stage parameters to a designed filter, its response for plots, and the stop-band edge the
 * stream carries on as `bandLimit`.
 */
import { getFftPlan } from '../fft';
import { kaiserTaps } from './kaiser';
import { designIir } from './iir-design';
import type { FilterParams } from './filter-params';
import { frequencyResponse, responseGrid, type FilterDesign, type FrequencyResponse } from './response';
import type { SosMatrix } from './zpk-to-sos';
import { windowedSincTaps } from './windowed-sinc';

const DESIGN_CACHE_LIMIT = 32;
const designCache = new Map<string, FilterDesign>();

/**
 * The taps or sections for filter parameters at a sample rate (Hz). Designs are cached (bounded,
 * least recently used dropped): callers must not modify the arrays. Throws RangeError naming the
 * field when the parameters cannot be designed (e.g. an edge at or above Nyquist).
 */
export function designFilter(params: FilterParams, sampleRate: number): FilterDesign {
  // Pasted taps need no design, and their key would be as long as the taps themselves.
  if (params.design === 'taps') return computeDesign(params, sampleRate);
  const key = `${sampleRate}|${JSON.stringify(params)}`;
  const cached = designCache.get(key);
  if (cached) {
    designCache.delete(key);
    designCache.set(key, cached);
    return cached;
  }
  const design = computeDesign(params, sampleRate);
  designCache.set(key, design);
  if (designCache.size > DESIGN_CACHE_LIMIT) designCache.delete(designCache.keys().next().value as string);
  return design;
}

function computeDesign(params: FilterParams, sampleRate: number): FilterDesign {
  switch (params.design) {
    case 'window':
      return { kind: 'fir', taps: windowedSincTaps({ ...params, sampleRate }) };
    case 'kaiser':
      return { kind: 'fir', taps: kaiserTaps({ ...params, sampleRate }).taps };
    case 'taps':
      return { kind: 'fir', taps: Float64Array.from(params.coefficients) };
    case 'iir': {
      const sos: SosMatrix = designIir({ ...params, ripple: params.family === 'chebyshev1' ? params.ripple : undefined, sampleRate });
      return { kind: 'iir', sos };
    }
  }
}

/** Magnitude (dB), unwrapped phase (rad) and group delay (samples and s) at `points` frequencies from 0 to fs/2. */
export function filterResponse(design: FilterDesign, sampleRate: number, points = 512): FrequencyResponse {
  return frequencyResponse(design, sampleRate, responseGrid(sampleRate, points));
}

/** Level below the pass band (dB) that marks the stop band when the edge is read off the response. */
export const STOP_BAND_LEVEL_DB = -40;

/**
 * Stop-band edge (Hz) of a design with a pass band at low frequencies: the frequency beyond which
 * the magnitude stays more than 40 dB below its peak, read off a dense grid (upper grid point of
 * the last crossing). Undefined when the response never settles that low before Nyquist (a
 * high-pass, a band-stop, or a design too weak to band-limit). 40 dB is where an alias is small
 * next to the signal for measurement work; Kaiser designs use their own edge instead.
 */
export function stopBandEdgeFromResponse(design: FilterDesign, sampleRate: number): number | undefined {
  const magnitudes = design.kind === 'fir' ? firMagnitudes(design.taps) : sosMagnitudes(design.sos);
  let peak = 0;
  for (const m of magnitudes) peak = Math.max(peak, m);
  if (!(peak > 0)) return undefined;
  const threshold = peak * Math.pow(10, STOP_BAND_LEVEL_DB / 20);
  let last = -1;
  for (let i = 0; i < magnitudes.length; i++) if (magnitudes[i] >= threshold) last = i;
  if (last >= magnitudes.length - 1) return undefined;
  return ((last + 1) / (magnitudes.length - 1)) * (sampleRate / 2);
}

// |H| on a grid from 0 to Nyquist inclusive, by a zero-padded FFT of the taps.
function firMagnitudes(taps: Float64Array): Float64Array {
  let size = 8192;
  while (size < 8 * taps.length && size < 1 << 20) size *= 2;
  const input = new Float64Array(size);
  input.set(taps.subarray(0, size));
  const spectrum = new Float64Array(2 * size);
  getFftPlan(size).forwardReal(input, spectrum);
  const m = new Float64Array(size / 2 + 1);
  for (let k = 0; k <= size / 2; k++) m[k] = Math.hypot(spectrum[2 * k], spectrum[2 * k + 1]);
  return m;
}

function sosMagnitudes(sos: SosMatrix): Float64Array {
  const points = 4097;
  const r = frequencyResponse({ kind: 'iir', sos }, 2, responseGrid(2, points));
  return Float64Array.from(r.magnitudeDb, (db) => Math.pow(10, db / 20));
}

/**
 * Stop-band edge (Hz) a filter gives its output stream: the Kaiser design's own edge (cut-off or
 * upper edge plus half the transition) for low-pass and band-pass, otherwise read off the response.
 */
export function filterStopBandEdge(params: FilterParams, design: FilterDesign, sampleRate: number): number | undefined {
  if (params.design === 'kaiser') {
    if (params.response === 'highpass' || params.response === 'bandstop') return undefined;
    const upper = (params.response === 'lowpass' ? params.cutoff : params.high) ?? 0;
    const edge = upper + params.transition / 2;
    return edge < sampleRate / 2 ? edge : undefined;
  }
  return stopBandEdgeFromResponse(design, sampleRate);
}
