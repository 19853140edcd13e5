/**
 * Image rejection ratio (dB) of a quadrature path with amplitude ratio `gainRatio` (linear, 1 =
 * balanced) and phase error `phaseRad` (radians), by the exact form
 * IRR = (1 + 2 g cos t + g^2) / (1 - 2 g cos t + g^2) (B. Razavi, "RF Microelectronics", 2nd ed.,
 * 2012, image-reject receivers). Returns Infinity for a perfectly balanced path.
 */
export function imageRejectionDb(gainRatio: number, phaseRad: number): number {
  if (!Number.isFinite(gainRatio) || gainRatio <= 0) throw new RangeError(`gainRatio: must be a finite number > 0, got ${gainRatio}`);
  if (!Number.isFinite(phaseRad)) throw new RangeError(`phaseRad: must be a finite number of radians, got ${phaseRad}`);
  const g = gainRatio;
  const c = 2 * g * Math.cos(phaseRad);
  const wanted = 1 + c + g * g;
  const image = 1 - c + g * g;
  if (image <= 0) return Infinity;
  return 10 * Math.log10(wanted / image);
}
