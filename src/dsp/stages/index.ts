/**
 * Registry of stage kinds: the chain document validator, the propagation, the runner and the
 * editor's stage picker all look kinds up here.
 */
import type { StageDefinition } from '../types';
import { dcRemoveStage } from './dc-remove';
import { gainStage } from './gain';
import { iqCorrectStage } from './iq-correct';
import { mixStage } from './mix';
import { quadratureCombineStage } from './quadrature-combine';
import { quadratureMixStage } from './quadrature-mix';
import { trimStage } from './trim';
import { decimateStage } from './decimate';
import { filterStage } from './filter';
// --- spectral engineer: import spectrumStage, spectrogramStage and measureStage here ---
import { spectrumStage } from './spectrum';
import { spectrogramStage } from './spectrogram';
import { measureStage } from './measure';

/** Every stage kind, in picker order (signal flow of a typical chain). */
const definitions: StageDefinition<any>[] = [
  quadratureCombineStage,
  quadratureMixStage,
  dcRemoveStage,
  iqCorrectStage,
  mixStage,
  filterStage,
  decimateStage,
  gainStage,
  trimStage,
  // --- spectral engineer: spectrumStage, spectrogramStage, measureStage ---
  spectrumStage,
  spectrogramStage,
  measureStage,
];

/** Stage definitions keyed by kind. */
export const stageDefinitions: Record<string, StageDefinition<any>> = Object.fromEntries(
  definitions.map((definition) => [definition.kind, definition]),
);

/** The definition of a stage kind, or undefined when the kind is unknown. */
export function getStageDefinition(kind: string): StageDefinition<any> | undefined {
  return Object.prototype.hasOwnProperty.call(stageDefinitions, kind) ? stageDefinitions[kind] : undefined;
}

/** Kind, title and one-line summary of every stage kind, for the stage picker. */
export function listStageKinds(): { kind: string; title: string; summary: string }[] {
  return definitions.map(({ kind, title, summary }) => ({ kind, title, summary }));
}

export { decimateStage, filterStage, dcRemoveStage, gainStage, iqCorrectStage, mixStage, quadratureCombineStage, quadratureMixStage, trimStage };
