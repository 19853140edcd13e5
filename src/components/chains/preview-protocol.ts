/**
 * Messages between the notebook and its preview worker, and the head-of-capture preview itself:
 * the chain runs on the first samples of a capture with the same engine as a full run, and every
 * probe is reduced to what a plot can show before it crosses back to the page.
 */
import type { ChainDocument } from '../../dsp/chain/document';
import { runChain } from '../../dsp/chain/runner';
import { reduceSpectrumMax } from '../../dsp/spectral/trace-reducer';
import type { ProbeOutput, StreamFormat } from '../../dsp/types';
import type { PreviewCapture } from '../../contracts/capture';

/** Samples of a capture's head the preview runs on (2^18). */
export const PREVIEW_HEAD_SAMPLES = 1 << 18;
/** Most points of a preview spectrum, and most frequency columns of a preview spectrogram. */
export const PREVIEW_SPECTRUM_POINTS = 2048;
const PREVIEW_SPECTROGRAM_COLUMNS = 512;
/** Samples per block handed to the runner: small enough that a cancel is seen within a few ms. */
const PREVIEW_BLOCK_SAMPLES = 16_384;

export type PreviewRequest = { type: 'run'; runId: number; document: ChainDocument; capture: PreviewCapture } | { type: 'cancel'; runId: number };

/** One probe as the page shows it: a spectrum reduced for plotting, a spectrogram image, readouts. */
export type PreviewProbe = Pick<ProbeOutput, 'stageId' | 'kind' | 'format' | 'readouts' | 'spectrogram'> & {
  spectrum?: NonNullable<ProbeOutput['spectrum']>;
};

export type PreviewReply =
  | { type: 'result'; runId: number; probes: PreviewProbe[]; samplesIn: number; sampleRate: number; fetchMs: number; runMs: number }
  | { type: 'error'; runId: number; message: string; stageId?: string };

/** Reduce a probe to at most a screen's worth of points (peaks kept at their true frequency). */
export function reduceProbe(probe: ProbeOutput): PreviewProbe {
  const out: PreviewProbe = { stageId: probe.stageId, kind: probe.kind, format: probe.format };
  if (probe.readouts) out.readouts = probe.readouts;
  if (probe.spectrum) {
    const reduced = reduceSpectrumMax(probe.spectrum.frequencies, probe.spectrum.levels, PREVIEW_SPECTRUM_POINTS);
    out.spectrum = { ...probe.spectrum, ...reduced };
  }
  if (probe.spectrogram) {
    const { frequencies, levels } = probe.spectrogram;
    const rows = levels.map((row) => reduceSpectrumMax(frequencies, row, PREVIEW_SPECTROGRAM_COLUMNS));
    out.spectrogram = { ...probe.spectrogram, frequencies: rows[0]?.frequencies ?? [], levels: rows.map((r) => r.levels) };
  }
  return out;
}

/** The head split into runner blocks (views, no copies). */
export function* headBlocks(head: Float32Array, valuesPerSample: number): Generator<Float32Array> {
  const step = PREVIEW_BLOCK_SAMPLES * valuesPerSample;
  for (let start = 0; start < head.length; start += step) yield head.subarray(start, Math.min(head.length, start + step));
}

/** Run the chain on a decoded head; probes reduced for the page. Throws an AbortError when cancelled. */
export async function previewOnHead(document: ChainDocument, input: StreamFormat, head: Float32Array, signal?: AbortSignal): Promise<{ probes: PreviewProbe[]; samplesIn: number }> {
  const valuesPerSample = input.sampleType === 'real' ? 1 : 2;
  const result = await runChain(document, input, headBlocks(head, valuesPerSample), { signal });
  return { probes: result.probes.map(reduceProbe), samplesIn: result.samplesIn };
}
