import type { Sides } from "./types";
import { normalSurvival } from "./normal-distribution";
import { requireSides } from "./require-sides";

/**
 * p-value of a z statistic: two-sided `2·(1 − Φ(|z|))`, one-sided `1 − Φ(z)` (the alternative is
 * "treatment above holdout"). Computed from the upper tail so tiny p-values keep their precision.
 *
 * Reference: the standard normal test; tails via {@link normalSurvival}. Complexity: O(1).
 *
 * @param z - the statistic; ±Infinity allowed (gives 0 or 1)
 * @param sides - 1 or 2
 * @returns p in [0, 1]
 * @throws RangeError when z is NaN or sides is not 1 or 2
 * @example zTestPValue(1.959963984540054, 2) // ≈ 0.05
 */
export function zTestPValue(z: number, sides: Sides): number {
  if (typeof z !== "number" || Number.isNaN(z)) throw new RangeError(`zTestPValue requires z to be a number, got ${String(z)}`);
  requireSides("zTestPValue", sides);
  if (sides === 1) return normalSurvival(z);
  return Math.min(1, 2 * normalSurvival(Math.abs(z)));
}
