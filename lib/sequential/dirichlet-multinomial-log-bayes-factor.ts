import { dirichletMultinomialLogBayesFactorUnchecked } from "./dirichlet-multinomial-log-bayes-factor-unchecked";
import { normalizeShares } from "./normalize-shares";
import { requireCounts } from "./require-counts";
import { requireFinite } from "./require-finite";

/**
 * Log Bayes factor of the anytime-valid sample-ratio test: Dirichlet–multinomial marginal
 * likelihood against the multinomial with the planned shares θ₀,
 * `log BF = log B(a + x) − log B(a) − Σ x_i log θ₀_i`, with the prior `a = priorStrength·θ₀`
 * (centred on the plan) and `B(a) = Π Γ(a_i)/Γ(Σ a_i)`. The multinomial coefficient cancels.
 *
 * BF is a nonnegative martingale under H0 (units assigned independently with the planned shares),
 * so `P(∃t: BF_t ≥ 1/α) ≤ α` by Ville's inequality and `min(1, min_s 1/BF_s)` is an always-valid
 * p-value. Reference: Lindon & Malek (2022), NeurIPS, "Anytime-valid inference for multinomial
 * count data". The prior strength is an explicit input: larger values detect small imbalances
 * sooner but large ones later. Complexity: O(k).
 *
 * @param counts - cumulative units per arm, non-negative integers
 * @param shares - planned shares θ₀, each > 0, summing to 1
 * @param priorStrength - Σ a_i > 0, the Dirichlet prior's concentration
 * @returns log BF (finite; 0 when every count is 0)
 * @throws RangeError for invalid counts, shares or priorStrength ≤ 0
 * @example Math.exp(dirichletMultinomialLogBayesFactor([60, 40], [0.5, 0.5], 2)) // ≈ 0.9130 (uniform prior: 2^100 / (101·C(100, 60)))
 */
export function dirichletMultinomialLogBayesFactor(counts: readonly number[], shares: readonly number[], priorStrength: number): number {
  const name = "dirichletMultinomialLogBayesFactor";
  const normalized = normalizeShares(name, shares);
  requireCounts(name, counts, normalized.length);
  requireFinite(name, "priorStrength", priorStrength);
  if (priorStrength <= 0) throw new RangeError(`${name} requires priorStrength > 0, got ${priorStrength}`);
  return dirichletMultinomialLogBayesFactorUnchecked(counts, normalized, priorStrength);
}
