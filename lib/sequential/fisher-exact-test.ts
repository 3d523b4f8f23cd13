import type { ExactAlternative } from "./exact-binomial-test";
import { hypergeometricProbability } from "./hypergeometric-probability";
import { requireFinite } from "./require-finite";

/**
 * Fisher's exact test of independence in a 2×2 table `[[a, b], [c, d]]` (rows: treatment,
 * holdout; columns: converted, not converted), for small counts.
 *
 * Conditions on the margins: `a` is hypergeometric. Two-sided p-value: the probability of tables
 * no more likely than the observed (relative tolerance 1 + 1e-7, as R's `fisher.test`);
 * `greater` is P(A ≥ a) (odds ratio > 1), `less` is P(A ≤ a). The odds ratio returned is the
 * sample one `ad/(bc)` (scipy's `fisher_exact`; R reports the conditional MLE instead).
 * Reference: Fisher (1935); Agresti (2013), *Categorical Data Analysis*.
 * Complexity: O(min(row, column totals)).
 *
 * @param table - `[[a, b], [c, d]]`, non-negative integers
 * @param alternative - "two-sided" (default), "greater" or "less"
 * @returns `{ p, oddsRatio }`; oddsRatio may be Infinity (b·c = 0, a·d > 0) or 0, and is NaN-free (0/0 gives 1)
 * @throws RangeError when the table is not 2×2 of non-negative integers
 * @example fisherExactTest([[3, 1], [1, 3]]).p // ≈ 0.4857
 */
export function fisherExactTest(
  table: readonly [readonly [number, number], readonly [number, number]],
  alternative: ExactAlternative = "two-sided",
): { p: number; oddsRatio: number } {
  if (!Array.isArray(table) || table.length !== 2 || !table.every((row) => Array.isArray(row) && row.length === 2)) {
    throw new RangeError("fisherExactTest requires a 2×2 table [[a, b], [c, d]]");
  }
  const [[a, b], [c, d]] = table;
  for (const value of [a, b, c, d]) {
    requireFinite("fisherExactTest", "a table cell", value);
    if (!Number.isInteger(value) || value < 0) throw new RangeError(`fisherExactTest requires non-negative integer cells, got ${value}`);
  }
  const white = a + c;
  const black = b + d;
  const drawn = a + b;
  const lowest = Math.max(0, drawn - black);
  const highest = Math.min(drawn, white);
  const mass = (x: number) => hypergeometricProbability(x, white, black, drawn);
  let p = 0;
  if (alternative === "greater") {
    for (let x = highest; x >= a; x--) p += mass(x);
  } else if (alternative === "less") {
    for (let x = lowest; x <= a; x++) p += mass(x);
  } else if (alternative === "two-sided") {
    const observed = mass(a) * (1 + 1e-7);
    for (let x = lowest; x <= highest; x++) {
      const value = mass(x);
      if (value <= observed) p += value;
    }
  } else {
    throw new RangeError(`fisherExactTest requires alternative "two-sided", "greater" or "less", got ${String(alternative)}`);
  }
  const numerator = a * d;
  const denominator = b * c;
  const oddsRatio = denominator > 0 ? numerator / denominator : numerator > 0 ? Infinity : numerator === 0 && denominator === 0 ? 1 : 0;
  return { p: Math.min(1, p), oddsRatio };
}
