import { equalFractions } from "./equal-fractions";
import { normalQuantile } from "./normal-distribution";
import { crossingProbabilities } from "./recursive-integration-crossing";
import { solveDecreasing } from "./group-sequential-root";

/**
 * O'Brien–Fleming's boundary constant C_B(K, α): with K equally spaced looks the critical value
 * at look k is C_B·√(K/k) (a constant boundary on the score scale), so it is C_B itself at the
 * last look; the constant keeps the overall type I error at α. Very strict early, close to the
 * fixed-horizon value at the end.
 *
 * Solved by bracketed root finding (Illinois regula falsi between z₁₋α/s and the Bonferroni
 * bound z₁₋α/(sK)) on the exact crossing probability from the recursive numerical integration.
 *
 * Reference: O'Brien & Fleming (1979), "A multiple testing procedure for clinical trials",
 * *Biometrics* 35(3), 549–556, https://doi.org/10.2307/2530245; tabulated in Jennison & Turnbull
 * (2000), *Group Sequential Methods with Applications to Clinical Trials*, Table 2.3. Assumes
 * equally spaced looks and the canonical joint distribution.
 * Complexity: O(K·m·w) per evaluation, about 10–20 evaluations.
 *
 * @param looks - the number of equally spaced looks K, an integer ≥ 1
 * @param significanceLevel - overall α in (0, 1), both sides together when two-sided
 * @param sides - 2 (default) or 1
 * @returns C_B(K, α), the critical value at the last look; look k uses C_B·√(K/k)
 * @throws RangeError when looks is not an integer ≥ 1, α is outside (0, 1) or sides is not 1 or 2
 * @example obrienFlemingConstant(5, 0.05) // ≈ 2.0401
 */
export function obrienFlemingConstant(looks: number, significanceLevel: number, sides: 1 | 2 = 2): number {
  if (!Number.isInteger(looks) || looks < 1) {
    throw new RangeError(`obrienFlemingConstant requires an integer number of looks ≥ 1, got ${looks}`);
  }
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`obrienFlemingConstant requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`obrienFlemingConstant requires sides 1 or 2, got ${String(sides)}`);
  }
  const single = normalQuantile(1 - significanceLevel / sides);
  if (looks === 1) return single;
  const fractions = equalFractions(looks);
  const error = (constant: number): number => {
    const upper = fractions.map((fraction) => constant / Math.sqrt(fraction));
    const lower = sides === 2 ? "symmetric" : fractions.map(() => -Infinity);
    return crossingProbabilities(fractions, upper, lower).total[looks - 1] - significanceLevel;
  };
  return solveDecreasing(error, single, normalQuantile(1 - significanceLevel / (sides * looks)));
}
