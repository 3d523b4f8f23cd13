import normal from "@stdlib/stats-base-dists-normal";

/**
 * Standard normal cumulative distribution function Φ(x), accurate deep into both tails.
 *
 * Reference: the standard normal distribution (Abramowitz & Stegun 1964, §26.2); computed by
 * `@stdlib/stats-base-dists-normal` from the complementary error function, so it does not
 * underflow near −8.3 as jStat's does.
 * Complexity: O(1).
 *
 * @param x - the point, any finite number (±Infinity give 0 and 1)
 * @returns Φ(x) in [0, 1]
 * @throws RangeError when x is NaN
 * @example normalCdf(1.959963984540054) // ≈ 0.975
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalCdf requires a number, got NaN");
  return normal.cdf(x, 0, 1);
}

/**
 * Upper tail of the standard normal, 1 − Φ(x), computed as Φ(−x) so it keeps its precision for large x.
 *
 * Reference: as {@link normalCdf}. Complexity: O(1).
 *
 * @param x - the point, any finite number
 * @returns 1 − Φ(x) in [0, 1]
 * @throws RangeError when x is NaN
 * @example normalSurvival(10) // ≈ 7.62e-24
 */
export function normalSurvival(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalSurvival requires a number, got NaN");
  return normal.cdf(-x, 0, 1);
}

/**
 * Standard normal quantile Φ⁻¹(p).
 *
 * Reference: as {@link normalCdf}; `@stdlib` inverts through the inverse error function.
 * Complexity: O(1).
 *
 * @param probability - a probability in (0, 1)
 * @returns the x with Φ(x) = probability
 * @throws RangeError when probability is outside (0, 1)
 * @example normalQuantile(0.975) // ≈ 1.959963984540054
 */
export function normalQuantile(probability: number): number {
  if (!(probability > 0 && probability < 1)) {
    throw new RangeError(`normalQuantile requires a probability in (0, 1), got ${probability}`);
  }
  return normal.quantile(probability, 0, 1);
}

/**
 * Standard normal density φ(x) = exp(−x²/2)/√(2π).
 *
 * Reference: as {@link normalCdf}. Complexity: O(1).
 *
 * @param x - the point
 * @returns φ(x) ≥ 0
 * @throws RangeError when x is NaN
 * @example normalDensity(0) // ≈ 0.3989422804014327
 */
export function normalDensity(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalDensity requires a number, got NaN");
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
}
