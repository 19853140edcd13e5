/**
 * iq-correct: undoes an I/Q gain and phase imbalance. Model of the impaired stream:
 * I = g cos(theta), Q = sin(theta + p) (g the I/Q amplitude ratio, p the phase error). Correction
 * (S. W. Ellingson, "Correcting I-Q Imbalance in Direct Conversion Receivers", 2003):
 * I' = I / g, Q' = -(sin p / (g cos p)) I + Q / cos p.
 * Blind mode estimates g, p and the DC offsets on the head of the stream (the first
 * `estimateSamples` samples: a head estimate, held back until they arrive), removes the DC and
 * corrects every sample with those values. Manual mode applies given values and leaves DC alone.
 */
import { z } from 'zod';
import type { StageDefinition } from '../types';
import { estimateIqImbalance } from '../measure/iq-imbalance';
import { BlockBuffer } from './block-buffer';
import { createHeadEstimatingProcessor } from './head-estimate';
import { amplitudeFromDb, radiansFromDegrees } from './levels';

/** Parameters of iq-correct: mode, gainDb [dB] and phaseDeg [deg] (manual), estimateSamples [samples] (blind). */
export const iqCorrectSchema = z
  .object({
    mode: z.enum(['blind', 'manual']).default('blind'),
    gainDb: z.number().finite().min(-6).max(6).default(0),
    phaseDeg: z.number().finite().min(-45).max(45).default(0),
    estimateSamples: z.number().int().min(64).max(4_194_304).default(262_144),
  })
  .strict();

export type IqCorrectParams = z.infer<typeof iqCorrectSchema>;

/** Largest phase error (deg) a blind estimate may find before the stream is judged not to be I/Q at all. */
const MAX_BLIND_PHASE_DEG = 45;

export const iqCorrectStage: StageDefinition<IqCorrectParams> = {
  kind: 'iq-correct',
  title: 'I/Q imbalance correction',
  summary: 'Corrects I/Q gain and phase imbalance, estimated blindly on the head of the stream or given by hand.',
  schema: iqCorrectSchema,
  fields: {
    mode: {
      label: 'Mode',
      help: "'blind': estimate DC, gain ratio and phase error on the first estimateSamples samples (a head estimate; assumes the signal itself has equal I and Q power and no I/Q correlation, e.g. noise, modulation, or a tone away from 0 Hz over many cycles) and correct the whole stream. 'manual': use gainDb and phaseDeg.",
    },
    gainDb: { label: 'Gain imbalance', unit: 'dB', help: "Manual mode: 20 log10 of the I/Q amplitude ratio g in I = g cos(theta), Q = sin(theta + p)." },
    phaseDeg: { label: 'Phase error', unit: 'deg', help: 'Manual mode: p in I = g cos(theta), Q = sin(theta + p); positive when I and Q correlate positively.' },
    estimateSamples: { label: 'Estimate length', unit: 'samples', help: 'Blind mode: samples at the start of the stream used for the estimate.' },
  },
  accepts: ['complex'],
  propagate(_params, input) {
    return { output: { ...input }, issues: [] };
  },
  create(params) {
    if (params.mode === 'manual') {
      const correct = corrector(amplitudeFromDb(params.gainDb), radiansFromDegrees(params.phaseDeg), 0, 0);
      const out = new BlockBuffer();
      return {
        process(block) {
          const y = out.take(block.length);
          correct(block, y);
          return y;
        },
        finish() {
          return out.take(0);
        },
      };
    }
    return createHeadEstimatingProcessor(2, params.estimateSamples, (head) => {
      const estimate = estimateIqImbalance(head);
      const phaseDeg = (estimate.phaseRad * 180) / Math.PI;
      if (Math.abs(phaseDeg) > MAX_BLIND_PHASE_DEG) {
        throw new RangeError(
          `blind estimate found a phase error of ${phaseDeg.toFixed(1)} deg (limit ${MAX_BLIND_PHASE_DEG}): I and Q are nearly the same signal, so this stream does not look like quadrature I/Q`,
        );
      }
      return corrector(estimate.gainRatio, estimate.phaseRad, estimate.dcI, estimate.dcQ);
    });
  },
};

/** Block corrector for gain ratio g (linear), phase error p (rad) and DC offsets (full scale 1.0). */
function corrector(gainRatio: number, phaseRad: number, dcI: number, dcQ: number) {
  const iScale = 1 / gainRatio;
  const crossScale = -Math.sin(phaseRad) / (gainRatio * Math.cos(phaseRad));
  const qScale = 1 / Math.cos(phaseRad);
  return (x: Float32Array, y: Float32Array): void => {
    for (let v = 0; v < x.length; v += 2) {
      const i = x[v] - dcI;
      const q = x[v + 1] - dcQ;
      y[v] = i * iScale;
      y[v + 1] = crossScale * i + qScale * q;
    }
  };
}
