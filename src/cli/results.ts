/**
 * The shape of `results.json`: what a run read, what it produced, and every probe with its stage
 * id and kind. Spectrum frequencies are in Hz relative to the probed stream's 0 Hz; levels and
 * the peak level are in the spectrum's unit (dBFS/Hz, dBFS, dBm/Hz or dBm).
 */
import type { ChainIssue, ProbeOutput, StreamFormat } from '../dsp/types';
import type { ChainDocument } from '../dsp/chain/document';
import type { CaptureSource } from './capture-source';

export interface RunFigures {
  probes: ProbeOutput[];
  outputFormat: StreamFormat;
  samplesIn: number;
  samplesOut: number;
  issues: ChainIssue[];
}

/** Build the JSON document written to DIR/results.json. */
export function buildResults(args: {
  engineVersion: string;
  chainPath: string;
  doc: ChainDocument;
  /** Only what the results describe, so the server's workers can pass a stored capture. */
  capture: Pick<CaptureSource, 'path' | 'kind' | 'datatypeLabel' | 'format'>;
  run: RunFigures;
  outputDatatype: string;
  seconds: number;
}): Record<string, unknown> {
  const { capture, run, doc } = args;
  return {
    engineVersion: args.engineVersion,
    createdAt: new Date().toISOString(),
    chain: {
      path: args.chainPath,
      name: doc.name,
      stages: doc.stages.map((s) => ({ id: s.id, kind: s.kind, probe: s.probe, bypass: s.bypass })),
    },
    input: {
      path: capture.path,
      container: capture.kind,
      datatype: capture.datatypeLabel,
      layout: capture.format.sampleType,
      sampleRate: capture.format.sampleRate,
      centerFrequency: capture.format.centerFrequency ?? null,
      samples: run.samplesIn,
      durationSeconds: run.samplesIn / capture.format.sampleRate,
    },
    output: {
      meta: 'output.sigmf-meta',
      data: 'output.sigmf-data',
      datatype: args.outputDatatype,
      layout: run.outputFormat.sampleType,
      sampleRate: run.outputFormat.sampleRate,
      centerFrequency: run.outputFormat.centerFrequency ?? null,
      samples: run.samplesOut,
    },
    probes: run.probes.map(probeJson),
    issues: run.issues,
    timing: { seconds: args.seconds, inputSamplesPerSecond: args.seconds > 0 ? run.samplesIn / args.seconds : null },
  };
}

function probeJson(probe: ProbeOutput): Record<string, unknown> {
  const out: Record<string, unknown> = { stageId: probe.stageId, kind: probe.kind, format: probe.format };
  if (probe.spectrum) {
    const s = probe.spectrum;
    out.spectrum = {
      unit: s.unit,
      peak: { frequency: s.peak.frequency, level: s.peak.level },
      resolutionBandwidth: s.resolutionBandwidth,
      segments: s.segments,
      frequencies: s.frequencies,
      levels: s.levels,
    };
  }
  if (probe.readouts) out.readouts = probe.readouts.map((r) => ({ name: r.name, value: r.value, unit: r.unit }));
  if (probe.spectrogram) out.spectrogram = probe.spectrogram;
  if (probe.trace) out.trace = probe.trace;
  if (probe.constellation) out.constellation = probe.constellation;
  return out;
}
