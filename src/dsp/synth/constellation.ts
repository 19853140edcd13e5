/**
 * Symbol alphabets of the digital carriers, each scaled to unit mean power so a carrier's level
 * means the same thing whatever its modulation. Bits map to points with Gray coding per axis
 * (neighbouring points differ in one bit), as is common practice.
 */

/** Digital modulations the synthesizer shapes with a root-raised-cosine pulse. */
export type DigitalModulation = 'bpsk' | 'qpsk' | 'qam16';

/** A constellation: interleaved I, Q of each point, unit mean power, and bits per symbol. */
export interface Constellation {
  points: Float64Array;
  bitsPerSymbol: number;
}

const QPSK_AMPLITUDE = Math.SQRT1_2;
/** 16-QAM levels +-1, +-3 have mean power 10 over I and Q together. */
const QAM16_SCALE = 1 / Math.sqrt(10);
/** Gray order of the four 16-QAM levels per axis: code 00 -> -3, 01 -> -1, 11 -> +1, 10 -> +3. */
const QAM16_LEVELS = [-3, -1, 3, 1];

function build(modulation: DigitalModulation): Constellation {
  switch (modulation) {
    case 'bpsk':
      return { points: Float64Array.of(-1, 0, 1, 0), bitsPerSymbol: 1 };
    case 'qpsk': {
      const points = new Float64Array(8);
      for (let code = 0; code < 4; code++) {
        points[2 * code] = (code & 2 ? -1 : 1) * QPSK_AMPLITUDE;
        points[2 * code + 1] = (code & 1 ? -1 : 1) * QPSK_AMPLITUDE;
      }
      return { points, bitsPerSymbol: 2 };
    }
    case 'qam16': {
      const points = new Float64Array(32);
      for (let code = 0; code < 16; code++) {
        points[2 * code] = QAM16_LEVELS[code >> 2] * QAM16_SCALE;
        points[2 * code + 1] = QAM16_LEVELS[code & 3] * QAM16_SCALE;
      }
      return { points, bitsPerSymbol: 4 };
    }
  }
}

const cache = new Map<DigitalModulation, Constellation>();

/** The constellation of a digital modulation (shared, do not modify). */
export function constellation(modulation: DigitalModulation): Constellation {
  let c = cache.get(modulation);
  if (!c) {
    c = build(modulation);
    cache.set(modulation, c);
  }
  return c;
}
