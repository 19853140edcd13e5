/**
 * The designed response a filter or decimate cell plots: magnitude (dB), phase (deg, unwrapped)
 * and group delay (samples) against frequency, with the pass and stop bands to shade. Run in a
 * worker: a long Kaiser design takes a few hundred milliseconds.
 */
import { designFilter, STOP_BAND_LEVEL_DB } from '../../dsp/filters/design';
import { filterSchema } from '../../dsp/filters/filter-params';
import { frequencyResponse, responseGrid, type FilterDesign } from '../../dsp/filters/response';
import { ANTI_ALIAS_ATTENUATION_DB, ANTI_ALIAS_PASS_FRACTION, antiAliasTaps, decimateSchema } from '../../dsp/stages/decimate';

export interface ResponseRequest {
  /** Changes whenever the response would (kind, parameters, input rate). */
  key: string;
  stageId: string;
  kind: 'filter' | 'decimate';
  params: unknown;
  /** Input sample rate of the stage (Hz). */
  sampleRate: number;
}

export type Band = [number, number];

export interface ResponseResult {
  key: string;
  stageId: string;
  frequencies: number[];
  magnitudeDb: number[];
  phaseDeg: number[];
  groupDelay: number[];
  passBands: Band[];
  stopBands: Band[];
  /** Frequency range (Hz) to show first; the whole 0..fs/2 is there when zoomed out. */
  initialRange: Band;
  /** Short description: "127 taps, FIR" or "4 biquad sections". */
  summary: string;
  /** A frequency to mark with a line (the new Nyquist frequency of a decimation), Hz. */
  marker?: { frequency: number; label: string };
}

export type ResponseReply = { ok: true; result: ResponseResult } | { ok: false; key: string; stageId: string; message: string };

/** Lowest level drawn (dB): exact zeros of a design would stretch the axis to the engine's floor. */
const DRAW_FLOOR_DB = -160;
const POINTS = 1024;

/** Contiguous frequency ranges where `inside(level)` holds. */
function regions(frequencies: number[], levels: number[], inside: (level: number) => boolean): Band[] {
  const out: Band[] = [];
  let start: number | null = null;
  for (let k = 0; k < levels.length; k++) {
    if (inside(levels[k])) {
      if (start === null) start = frequencies[k];
    } else if (start !== null) {
      out.push([start, frequencies[k - 1]]);
      start = null;
    }
  }
  if (start !== null) out.push([start, frequencies[frequencies.length - 1]]);
  return out.filter(([a, b]) => b > a);
}

function grid(nyquist: number, focus: number): number[] {
  if (focus >= nyquist) return responseGrid(2 * nyquist, POINTS);
  // Dense up to the band of interest, coarser beyond, so a narrow decimation filter is resolved.
  const near = Array.from({ length: POINTS }, (_, i) => (i * focus) / (POINTS - 1));
  const far = Array.from({ length: 257 }, (_, i) => focus + ((i + 1) * (nyquist - focus)) / 257);
  return [...near, ...far];
}

function describe(design: FilterDesign): string {
  return design.kind === 'fir' ? `FIR, ${design.taps.length} taps, delay ${((design.taps.length - 1) / 2).toString()} samples` : `IIR, ${design.sos.length} biquad section${design.sos.length === 1 ? '' : 's'}`;
}

/** Kaiser designs state their bands; the others are read off the response (-3 dB and -40 dB re peak). */
function specBands(params: Record<string, unknown>, nyquist: number): { pass: Band[]; stop: Band[] } | undefined {
  if (params.design !== 'kaiser') return undefined;
  const half = Number(params.transition) / 2;
  const clip = (bands: Band[]) => bands.map(([a, b]) => [Math.max(0, a), Math.min(nyquist, b)] as Band).filter(([a, b]) => b > a);
  const c = Number(params.cutoff);
  const lo = Number(params.low);
  const hi = Number(params.high);
  switch (params.response) {
    case 'lowpass':
      return { pass: clip([[0, c - half]]), stop: clip([[c + half, nyquist]]) };
    case 'highpass':
      return { pass: clip([[c + half, nyquist]]), stop: clip([[0, c - half]]) };
    case 'bandpass':
      return { pass: clip([[lo + half, hi - half]]), stop: clip([[0, lo - half], [hi + half, nyquist]]) };
    case 'bandstop':
      return { pass: clip([[0, lo - half], [hi + half, nyquist]]), stop: clip([[lo + half, hi - half]]) };
  }
  return undefined;
}

/** The response to plot for a filter or decimate stage; throws RangeError naming the field when it cannot be designed. */
export function computeResponse(request: ResponseRequest): ResponseResult {
  const { sampleRate } = request;
  const nyquist = sampleRate / 2;
  if (request.kind === 'decimate') {
    const params = decimateSchema.parse(request.params);
    const newNyquist = nyquist / params.factor;
    const focus = Math.min(nyquist, 4 * newNyquist);
    const design: FilterDesign = { kind: 'fir', taps: params.antiAlias ? antiAliasTaps(params.factor) : Float64Array.of(1) };
    const r = frequencyResponse(design, sampleRate, grid(nyquist, focus));
    return {
      ...shape(request, r),
      passBands: params.antiAlias ? [[0, ANTI_ALIAS_PASS_FRACTION * newNyquist]] : [],
      stopBands: params.antiAlias ? [[newNyquist, nyquist]] : [],
      initialRange: [0, focus],
      summary: params.antiAlias ? `Built-in anti-alias low-pass: ${describe(design)}, ${ANTI_ALIAS_ATTENUATION_DB} dB stop band` : 'No built-in filter: every sample but one in ' + params.factor + ' is dropped',
      marker: { frequency: newNyquist, label: 'new Nyquist' },
    };
  }
  const params = filterSchema.parse(request.params);
  const design = designFilter(params, sampleRate);
  const r = frequencyResponse(design, sampleRate, grid(nyquist, nyquist));
  const base = shape(request, r);
  const peak = Math.max(...r.magnitudeDb);
  const stated = specBands(params as Record<string, unknown>, nyquist);
  return {
    ...base,
    passBands: stated?.pass ?? regions(r.frequencies, r.magnitudeDb, (m) => m >= peak - 3),
    stopBands: stated?.stop ?? regions(r.frequencies, r.magnitudeDb, (m) => m <= peak + STOP_BAND_LEVEL_DB),
    initialRange: [0, nyquist],
    summary: describe(design),
  };
}

function shape(request: ResponseRequest, r: ReturnType<typeof frequencyResponse>): Omit<ResponseResult, 'passBands' | 'stopBands' | 'initialRange' | 'summary'> {
  return {
    key: request.key,
    stageId: request.stageId,
    frequencies: r.frequencies,
    magnitudeDb: r.magnitudeDb.map((m) => Math.max(DRAW_FLOOR_DB, m)),
    phaseDeg: r.phase.map((p) => (p * 180) / Math.PI),
    groupDelay: r.groupDelay,
  };
}
