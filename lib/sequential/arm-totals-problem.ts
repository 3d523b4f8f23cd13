import type { ArmTotals, MetricKind } from "./types";

/**
 * Which rule one arm's sufficient statistics break, or null when they are valid: finite numbers,
 * `n` a non-negative integer; a conversion metric needs integer `0 ≤ sum ≤ n` with `sumSq = sum`; a
 * mean metric needs `sumSq ≥ sum²/n` (Cauchy–Schwarz, up to rounding) and zeros when `n = 0`.
 * The non-throwing form of {@link validateArmTotals}, for the daily loop.
 *
 * Reference: none (input validation). Complexity: O(1).
 *
 * @param totals - the arm's `{ n, sum, sumSq }`
 * @param metric - "conversion" or "mean"
 * @returns a short description of the broken rule, or null
 * @example armTotalsProblem({ n: 10, sum: 11, sumSq: 11 }, "conversion") // "conversions to be an integer in [0, n], got 11 of 10"
 */
export function armTotalsProblem(totals: ArmTotals, metric: MetricKind): string | null {
  if (totals === null || typeof totals !== "object") return "totals { n, sum, sumSq }";
  const { n, sum, sumSq } = totals;
  if (!Number.isFinite(n) || !Number.isFinite(sum) || !Number.isFinite(sumSq)) return `finite n, sum and sumSq, got ${n}, ${sum}, ${sumSq}`;
  if (n < 0 || !Number.isInteger(n)) return `n to be a non-negative integer, got ${n}`;
  if (metric === "conversion") {
    if (!Number.isInteger(sum) || sum < 0 || sum > n) return `conversions to be an integer in [0, n], got ${sum} of ${n}`;
    if (sumSq !== sum) return `sumSq = sum for a conversion metric, got ${sumSq} and ${sum}`;
    return null;
  }
  if (metric !== "mean") return `metric "conversion" or "mean", got ${String(metric)}`;
  if (sumSq < 0) return `sumSq ≥ 0, got ${sumSq}`;
  if (n === 0) return sum !== 0 || sumSq !== 0 ? "sum = sumSq = 0 when n = 0" : null;
  const floor = (sum * sum) / n;
  return sumSq < floor - 1e-9 * Math.max(1, floor) ? `sumSq ≥ sum²/n, got ${sumSq} < ${floor}` : null;
}
