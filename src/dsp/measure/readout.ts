/**
 * Building readouts that never carry +/-Infinity or NaN: a value that cannot be computed becomes
 * null with a reason in words, so "not computable" is told apart from a number.
 */
import type { Readout, ReadoutFlag } from '../types';

export interface ReadoutExtras {
  flags?: ReadoutFlag[];
  definition?: string;
  /** Used when `value` turns out not to be finite. */
  reason?: string;
}

/** A readout of `value` (unit as shown); a non-finite or null value becomes null with a reason. */
export function readout(name: string, value: number | null, unit: string, extras: ReadoutExtras = {}): Readout {
  const out: Readout = { name, value: null, unit };
  if (value !== null && Number.isFinite(value)) out.value = value;
  else {
    out.reason =
      extras.reason ??
      (value === null ? 'could not be computed from this stream' : Number.isNaN(value) ? 'undefined for this stream (0/0)' : 'unbounded for this stream (a ratio to zero power)');
  }
  if (extras.flags && extras.flags.length > 0) out.flags = [...new Set(extras.flags)];
  if (extras.definition) out.definition = extras.definition;
  return out;
}

/** A readout that could not be computed: value null and why. */
export function notComputable(name: string, unit: string, reason: string, extras: Omit<ReadoutExtras, 'reason'> = {}): Readout {
  return readout(name, null, unit, { ...extras, reason });
}
