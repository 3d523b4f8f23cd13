import { equalFractions } from "./equal-fractions";
import { normalQuantile } from "./normal-distribution";
import { crossingProbabilities } from "./recursive-integration-crossing";
import { solveDecreasing } from "./group-sequential-root";

/**
 * Pocock's constant boundary C_P(K, α): the one critical value used at every one of K equally
 * spaced looks (reject when |Z_k| ≥ C_P, or Z_k ≥ C_P one-sided) that keeps the overall type I
 * error at α. Use it for a classic group-sequential design with K equal groups planned ahead.
 *
 * Solved by bracketed root finding (Illinois regula falsi between z₁₋α/s and the Bonferroni
 * bound z₁₋α/(sK)) on the exact crossing probability from the recursive numerical integration.
 *
 * Reference: Pocock (1977), "Group sequential methods in the design and analysis of clinical
 * trials", *Biometrika* 64(2), 191–199, https://doi.org/10.1093/biomet/64.2.191; tabulated in
 * Jennison & Turnbull (2000), *Group Sequential Methods with Applications to Clinical Trials*,
 * Table 2.1. Assumes equally spaced looks and the canonical joint distribution.
 * Complexity: O(K·m·w) per evaluation, about 10–20 evaluations.
 *
 * @param looks - the number of equally spaced looks K, an integer ≥ 1
 * @param significanceLevel - overall α in (0, 1), both sides together when two-sided
 * @param sides - 2 (default) or 1
 * @returns C_P(K, α) on the z scale; z₁₋α/s when K = 1
 * @throws RangeError when looks is not an integer ≥ 1, α is outside (0, 1) or sides is not 1 or 2
 * @example pocockConstant(5, 0.05) // ≈ 2.4132
 */
export function pocockConstant(looks: number, significanceLevel: number, sides: 1 | 2 = 2): number {
  if (!Number.isInteger(looks) || looks < 1) {
    throw new RangeError(`pocockConstant requires an integer number of looks ≥ 1, got ${looks}`);
  }
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`pocockConstant requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
  if (sides !== 1 && sides !== 2) throw new RangeError(`pocockConstant requires sides 1 or 2, got ${String(sides)}`);
  const single = normalQuantile(1 - significanceLevel / sides);
  if (looks === 1) return single;
  const fractions = equalFractions(looks);
  const error = (critical: number): number => {
    const upper = fractions.map(() => critical);
    const lower = sides === 2 ? "symmetric" : fractions.map(() => -Infinity);
    return crossingProbabilities(fractions, upper, lower).total[looks - 1] - significanceLevel;
  };
  return solveDecreasing(error, single, normalQuantile(1 - significanceLevel / (sides * looks)));
}
