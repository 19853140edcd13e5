/**
 * What a readout's flags and reason tell an engineer, in words: a caveat on a value that was
 * computed (flags) or why there is no value (reason). Shared by the run page and the chain preview.
 */
import type { ReadoutFlag } from '@/dsp/types';

const flagText: Record<ReadoutFlag, string> = {
  'start-up-transient': 'includes the start-up transient',
  'holds-tone': 'holds the tone at 0 Hz',
  'window-limited': 'limited by the window',
  'tone-at-dc': 'tone at 0 Hz',
  'assumption-fails': "the estimate's assumption fails",
  clipped: 'input clipped',
};

/** Flags of a readout as one line of text ("tone at 0 Hz; input clipped"), or '' when none. */
export function readoutFlagsText(flags: readonly ReadoutFlag[] | undefined): string {
  return (flags ?? []).map((flag) => flagText[flag] ?? flag).join('; ');
}

/** The note shown under a readout: the reason when there is no value, else the caveats. */
export function readoutNote(readout: { value: number | null; reason?: string; flags?: readonly ReadoutFlag[] }): string {
  if (readout.value === null) return readout.reason ?? 'Not measurable on this capture';
  return readoutFlagsText(readout.flags);
}
