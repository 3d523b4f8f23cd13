/**
 * Information fractions of a campaign's actual looks for the cost of peeking: cumulative units at
 * each look divided by those at the last look, dropping looks without new units (a repeated look
 * adds no chance to fire). Only the ratios between looks matter for the error of repeated naive
 * tests (Brownian-motion correlations √(t_i/t_j)), so scaling by the last look instead of the plan's
 * n* gives the same error.
 *
 * Reference: Armitage, McPherson & Rowe (1969), *JRSS A* 132; Jennison & Turnbull (2000), ch. 19.
 * Complexity: O(looks).
 *
 * @param cumulativeUnits - units (over the compared arms) at each look, non-decreasing, ≥ 0
 * @returns strictly increasing fractions in (0, 1] ending at 1, empty when no look has units
 * @throws RangeError when a value is negative, not finite, or the series decreases
 * @example lookFractions([0, 100, 100, 200, 400]) // [0.25, 0.5, 1]
 */
export function lookFractions(cumulativeUnits: readonly number[]): number[] {
  let previous = 0;
  const kept: number[] = [];
  for (const units of cumulativeUnits) {
    if (typeof units !== "number" || !Number.isFinite(units) || units < 0) throw new RangeError(`lookFractions requires finite units ≥ 0, got ${String(units)}`);
    if (units < previous) throw new RangeError(`lookFractions requires non-decreasing units, got ${units} after ${previous}`);
    if (units > previous) kept.push(units);
    previous = units;
  }
  if (kept.length === 0) return [];
  const last = kept[kept.length - 1];
  return kept.map((units, index) => (index === kept.length - 1 ? 1 : units / last));
}
