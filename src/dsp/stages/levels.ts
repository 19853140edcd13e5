/** Level conversions shared by the stages (amplitude decibels, full scale 1.0). */

/** Linear amplitude factor of a gain in dB (20 log10 convention). */
export function amplitudeFromDb(db: number): number {
  return Math.pow(10, db / 20);
}

/** Level in dB (20 log10) of a linear amplitude; -Infinity for 0. */
export function dbFromAmplitude(amplitude: number): number {
  return 20 * Math.log10(amplitude);
}

/** Radians from degrees. */
export function radiansFromDegrees(degrees: number): number {
  return (degrees * Math.PI) / 180;
}
