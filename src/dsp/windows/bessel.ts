/** Modified Bessel function of the first kind, order 0, by its power series (converges for all x). */
export function besselI0(x: number): number {
  // Terms (x/2)^(2k) / (k!)^2; stop when a term no longer changes the sum in double precision.
  const half = x / 2;
  const q = half * half;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 500; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return sum;
}
