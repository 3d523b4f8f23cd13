import { requireFinite } from "./require-finite";

/**
 * Natural logarithm of the gamma function, log Γ(z) for z > 0, to about 1e-15 relative: the
 * Stirling series with five correction terms for z ≥ 15, shifted up by the recurrence below.
 *
 * Reference: Abramowitz & Stegun (1964), *Handbook of Mathematical Functions*, 6.1.40–6.1.41.
 * Complexity: O(1) (at most 15 shift steps).
 *
 * @param z - a finite number > 0
 * @returns log Γ(z)
 * @throws RangeError when z ≤ 0 or not finite
 * @example logGamma(5) // ≈ 3.1780538303479458 (= log 24)
 */
export function logGamma(z: number): number {
  requireFinite("logGamma", "z", z);
  if (z <= 0) throw new RangeError(`logGamma requires z > 0, got ${z}`);
  let shift = 0;
  let x = z;
  while (x < 15) {
    shift += Math.log(x);
    x += 1;
  }
  const inverse = 1 / x;
  const inverseSquared = inverse * inverse;
  const series = inverse * (1 / 12 - inverseSquared * (1 / 360 - inverseSquared * (1 / 1260 - inverseSquared * (1 / 1680 - inverseSquared / 1188))));
  return (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + series - shift;
}
