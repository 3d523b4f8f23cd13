import type { ArmTotals, MetricKind } from "./types";
import { armTotalsProblem } from "./arm-totals-problem";

/**
 * Argument guard for one arm's sufficient statistics (the rules of {@link armTotalsProblem}).
 *
 * Reference: none (input validation). Complexity: O(1).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param label - which arm, for the message (e.g. "treatment")
 * @param totals - the arm's `{ n, sum, sumSq }`
 * @param metric - "conversion" or "mean"
 * @returns nothing
 * @throws RangeError("<functionName> requires <label> <rule>") naming the broken rule
 * @example validateArmTotals("twoSampleZTest", "holdout", { n: 100, sum: 7, sumSq: 7 }, "conversion") // passes
 */
export function validateArmTotals(functionName: string, label: string, totals: ArmTotals, metric: MetricKind): void {
  const problem = armTotalsProblem(totals, metric);
  if (problem !== null) throw new RangeError(`${functionName} requires ${label} ${problem}`);
}
