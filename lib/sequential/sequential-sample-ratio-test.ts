import { dirichletMultinomialLogBayesFactor } from "./dirichlet-multinomial-log-bayes-factor";

/**
 * Anytime-valid sample-ratio-mismatch test over a series of looks at cumulative units per arm:
 * the Dirichlet–multinomial Bayes factor at each look and the always-valid p-value
 * `p_t = min(1, p_{t−1}, 1/BF_t)`.
 *
 * Reference: Lindon & Malek (2022), NeurIPS, "Anytime-valid inference for multinomial count data";
 * see {@link dirichletMultinomialLogBayesFactor}. Looking once a day at cumulative counts reads the
 * unit-level martingale at stopping times, so the guarantee holds. Complexity: O(looks · k).
 *
 * @param looks - cumulative units per arm at each look, non-decreasing in time
 * @param shares - planned shares, each > 0, summing to 1
 * @param priorStrength - Dirichlet concentration > 0
 * @returns per look `{ bayesFactor, p }`; bayesFactor may be Infinity for an extreme mismatch
 * @throws RangeError for invalid counts, shares or prior strength (see {@link dirichletMultinomialLogBayesFactor})
 * @example sequentialSampleRatioTest([[50, 50], [300, 100]], [0.5, 0.5], 100)[1].p // ≈ 2.8e-18
 */
export function sequentialSampleRatioTest(
  looks: readonly (readonly number[])[],
  shares: readonly number[],
  priorStrength: number,
): { bayesFactor: number; p: number }[] {
  if (!Array.isArray(looks)) throw new RangeError("sequentialSampleRatioTest requires an array of looks");
  let p = 1;
  return looks.map((counts) => {
    const logBayesFactor = dirichletMultinomialLogBayesFactor(counts, shares, priorStrength);
    p = Math.min(p, Math.exp(-logBayesFactor));
    return { bayesFactor: Math.exp(logBayesFactor), p };
  });
}
