import { analogPrototype, type IirFamily } from './analog-prototypes';
import { checkedEdges, type BandEdges, type FilterResponse } from './band-edges';
import { bilinear, lowpassToBandpass, lowpassToBandstop, lowpassToHighpass, lowpassToLowpass, type Zpk } from './zpk';
import { zpkToSos, type SosMatrix } from './zpk-to-sos';

export interface IirSpec extends BandEdges {
  family: IirFamily;
  response: FilterResponse;
  /** Order of the analogue prototype (band designs have twice as many poles). */
  order: number;
  /** Chebyshev I pass-band ripple, dB. */
  ripple?: number;
  /** Hz. */
  sampleRate: number;
}

/**
 * Digital IIR design as zeros, poles and gain: analogue prototype, frequency transformation at
 * pre-warped edges (2 fs tan(pi f / fs)), then the bilinear transform, so each edge (Hz) lands
 * exactly where the prototype defines it (Butterworth -3.01 dB, Chebyshev I end of ripple band,
 * Bessel phase midpoint). Same steps as scipy.signal.iirfilter.
 */
export function designIirZpk(spec: IirSpec): Zpk {
  const edges = checkedEdges(spec.response, spec, spec.sampleRate);
  const prototype = analogPrototype(spec.family, spec.order, spec.ripple);
  // Work with a sample rate of 2 (edges relative to Nyquist), as that keeps values near 1.
  const fs = 2;
  const warped = edges.map((f) => 2 * fs * Math.tan((Math.PI * (f / (spec.sampleRate / 2))) / fs));
  let analog: Zpk;
  if (spec.response === 'lowpass') analog = lowpassToLowpass(prototype, warped[0]);
  else if (spec.response === 'highpass') analog = lowpassToHighpass(prototype, warped[0]);
  else {
    const bw = warped[1] - warped[0];
    const wo = Math.sqrt(warped[0] * warped[1]);
    analog = spec.response === 'bandpass' ? lowpassToBandpass(prototype, wo, bw) : lowpassToBandstop(prototype, wo, bw);
  }
  return bilinear(analog, fs);
}

/** Digital IIR design as second-order sections ([b0 b1 b2 1 a1 a2] per row). */
export function designIir(spec: IirSpec): SosMatrix {
  return zpkToSos(designIirZpk(spec));
}
