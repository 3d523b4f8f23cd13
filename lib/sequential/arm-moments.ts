import type { ArmTotals, MetricKind } from "./types";
import { requireEstimableArm } from "./require-estimable-arm";

/**
 * Mean and per-unit variance of one arm from its sufficient statistics.
 *
 * Conversion metric: mean `m = sum/n`, variance `m(1 − m)` (the plug-in of the unpooled Wald
 * interval). Mean metric: mean `sum/n`, the unbiased sample variance `(sumSq − sum²/n)/(n − 1)`.
 * Reference: DESIGN.md §3; any text on the two-sample z-test, e.g. Agresti (2013), *Categorical
 * Data Analysis*. Assumes independent units.
 * Complexity: O(1).
 *
 * @param totals - `{ n, sum, sumSq }` of the arm (cumulative)
 * @param metric - "conversion" or "mean"
 * @returns `{ mean, variance }`, variance ≥ 0 per unit
 * @throws RangeError when the totals are invalid, when n < 1 (conversion) or n < 2 (mean)
 * @example armMoments({ n: 200, sum: 30, sumSq: 30 }, "conversion") // { mean: 0.15, variance: 0.1275 }
 */
export function armMoments(totals: ArmTotals, metric: MetricKind): { mean: number; variance: number } {
  requireEstimableArm("armMoments", "arm", totals, metric);
  const mean = totals.sum / totals.n;
  if (metric === "conversion") return { mean, variance: mean * (1 - mean) };
  const variance = Math.max(0, (totals.sumSq - totals.sum * mean) / (totals.n - 1));
  return { mean, variance };
}
