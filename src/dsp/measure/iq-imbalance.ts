/**
 * Blind I/Q gain and phase imbalance estimate of a complex capture (S. W. Ellingson, "Correcting
 * I-Q Imbalance in Direct Conversion Receivers", 2003).
 *
 * The estimator assumes the wanted signal has equal power in I and Q and no I/Q correlation (true
 * for noise, for most modulations and for a tone away from 0 Hz averaged over many cycles); any
 * remaining power ratio or correlation is then the front end's imbalance.
 */

/** Result of the blind estimate. */
export interface IqImbalanceEstimate {
  /** Amplitude ratio I/Q (linear, 1 = balanced): sqrt(<I^2>/<Q^2>) after mean removal. */
  gainRatio: number;
  /** Phase error in radians: asin(<IQ>/sqrt(<I^2><Q^2>)) after mean removal; positive when I and Q correlate positively. */
  phaseRad: number;
  /** Mean of I (full scale 1.0). */
  dcI: number;
  /** Mean of Q (full scale 1.0). */
  dcQ: number;
}

/**
 * Blind estimate of gain ratio, phase error (rad) and DC offsets from interleaved I/Q samples.
 * A channel without power after mean removal gives the neutral values (gainRatio 1, phaseRad 0).
 */
export function estimateIqImbalance(iq: Float32Array): {
  gainRatio: number;
  phaseRad: number;
  dcI: number;
  dcQ: number;
} {
  if (!(iq instanceof Float32Array)) throw new TypeError('iq: must be a Float32Array of interleaved I/Q values');
  if (iq.length === 0) throw new RangeError('iq: needs at least one complex sample');
  if (iq.length % 2 !== 0) throw new RangeError(`iq: length ${iq.length} is odd, not a whole number of complex samples`);
  const n = iq.length / 2;
  let sumI = 0;
  let sumQ = 0;
  for (let k = 0; k < iq.length; k += 2) {
    sumI += iq[k];
    sumQ += iq[k + 1];
  }
  const dcI = sumI / n;
  const dcQ = sumQ / n;
  // Second pass on centred values: one-pass moment formulas lose the imbalance to cancellation
  // when the DC offset is large compared with the signal.
  let ii = 0;
  let qq = 0;
  let iqSum = 0;
  for (let k = 0; k < iq.length; k += 2) {
    const i = iq[k] - dcI;
    const q = iq[k + 1] - dcQ;
    ii += i * i;
    qq += q * q;
    iqSum += i * q;
  }
  return imbalanceFromMoments(ii / n, qq / n, iqSum / n, dcI, dcQ);
}

/**
 * Gain ratio and phase error from centred second moments <I^2>, <Q^2>, <IQ> and the means.
 * When either channel carries no power nothing can be estimated: the neutral values (gainRatio 1,
 * phaseRad 0) are returned with the means.
 */
export function imbalanceFromMoments(ii: number, qq: number, iq: number, dcI: number, dcQ: number): IqImbalanceEstimate {
  if (!(ii > 0) || !(qq > 0) || !Number.isFinite(ii + qq + iq)) {
    return { gainRatio: 1, phaseRad: 0, dcI, dcQ };
  }
  const gainRatio = Math.sqrt(ii / qq);
  const sinPhase = Math.min(1, Math.max(-1, iq / Math.sqrt(ii * qq)));
  return { gainRatio, phaseRad: Math.asin(sinPhase), dcI, dcQ };
}
