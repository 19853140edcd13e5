/**
 * Channel layouts of a capture: how the values of the data file make up the engine's samples.
 * The names are the engine's SampleType (src/dsp/types.ts).
 */
import type { SampleType } from '../types';
import { FormatError, type Datatype } from './datatype';

/** The channel layouts a capture can have. */
export const CHANNEL_LAYOUTS: readonly SampleType[] = ['complex', 'real', 'real-pair'];

/** Parse a layout name given by a person (`complex`, `real`, `real-pair`); FormatError otherwise. */
export function parseLayout(name: string, field = 'layout'): SampleType {
  if ((CHANNEL_LAYOUTS as readonly string[]).includes(name)) return name as SampleType;
  throw new FormatError(`${field}: unknown layout "${name}" (expected complex, real or real-pair)`, field);
}

/**
 * Layout implied by a SigMF datatype and channel count: `c*` is complex (one channel), `r*` with
 * one channel is real, `r*` with two channels is real-pair (two real ADC channels interleaved).
 */
export function layoutFromDatatype(datatype: Datatype, numChannels = 1, field = 'core:num_channels'): SampleType {
  if (!Number.isInteger(numChannels) || numChannels < 1) {
    throw new FormatError(`${field}: must be a positive integer, got ${numChannels}`, field);
  }
  if (datatype.complex) {
    if (numChannels !== 1) {
      throw new FormatError(`${field}: ${numChannels} complex channels are not supported (only 1)`, field);
    }
    return 'complex';
  }
  if (numChannels === 1) return 'real';
  if (numChannels === 2) return 'real-pair';
  throw new FormatError(`${field}: ${numChannels} real channels are not supported (1 or 2)`, field);
}

/** Check that a layout the user asked for fits a datatype (a `c` type must be complex). */
export function checkLayoutFits(layout: SampleType, datatype: Datatype, field = 'layout'): void {
  if (datatype.complex && layout !== 'complex') {
    throw new FormatError(`${field}: ${layout} does not fit complex datatype ${datatype.name} (use an r datatype)`, field);
  }
  if (!datatype.complex && layout === 'complex') {
    throw new FormatError(`${field}: complex layout needs a c datatype, got ${datatype.name}`, field);
  }
}

/** The SigMF description of a layout: real or complex, and the channel count. */
export function sigmfShapeOfLayout(layout: SampleType): { complex: boolean; numChannels: number } {
  return layout === 'complex' ? { complex: true, numChannels: 1 } : { complex: false, numChannels: layout === 'real-pair' ? 2 : 1 };
}
