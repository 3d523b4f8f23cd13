import type { ArmTotals, MetricKind } from "./types";
import { validateArmTotals } from "./validate-arm-totals";

/**
 * Argument guard: valid totals (see {@link validateArmTotals}) with enough units to estimate a mean
 * and a variance — n ≥ 1 for a conversion metric, n ≥ 2 for a mean metric (sample variance).
 *
 * Reference: none (input validation). Complexity: O(1).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param label - which arm, for the message
 * @param totals - the arm's `{ n, sum, sumSq }`
 * @param metric - "conversion" or "mean"
 * @returns nothing
 * @throws RangeError naming the function, the arm and the rule
 * @example requireEstimableArm("liftEstimate", "holdout", { n: 10, sum: 1, sumSq: 1 }, "conversion") // passes
 */
export function requireEstimableArm(functionName: string, label: string, totals: ArmTotals, metric: MetricKind): void {
  validateArmTotals(functionName, label, totals, metric);
  const minimum = metric === "conversion" ? 1 : 2;
  if (totals.n < minimum) throw new RangeError(`${functionName} requires ${label}.n ≥ ${minimum} for a ${metric} metric, got ${totals.n}`);
}
