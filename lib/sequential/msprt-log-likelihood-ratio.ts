import { requireFinite } from "./require-finite";

/**
 * Logarithm of the mixture sequential probability ratio statistic (mSPRT) with a normal mixing
 * distribution N(0, τ²) on the effect, for an estimate `Δ ~ N(θ, V)` tested against θ = 0:
 * `log Λ = ½·log(V/(V + τ²)) + τ²Δ²/(2V(V + τ²))`.
 *
 * Reference: Robbins (1970), *Ann. Math. Statist.* 41; Johari, Koomen, Pekelis & Walsh (2022),
 * *Operations Research* 70(3), "Always Valid Inference: Continuous Monitoring of A/B Tests". Λ is a nonnegative
 * martingale under H0 when V is known; with an estimated V the guarantee is asymptotic
 * (Waudby-Smith et al. 2024). Complexity: O(1).
 *
 * @param estimate - Δ, the lift estimate (finite)
 * @param variance - V > 0, its variance
 * @param tau - τ > 0, the mixing standard deviation, in the units of Δ
 * @returns log Λ (finite)
 * @throws RangeError when an argument is not finite or variance/tau ≤ 0
 * @example msprtLogLikelihoodRatio(0, 1, 1) // ≈ −0.3466 (= ½ log ½)
 */
export function msprtLogLikelihoodRatio(estimate: number, variance: number, tau: number): number {
  requireFinite("msprtLogLikelihoodRatio", "estimate", estimate);
  requireFinite("msprtLogLikelihoodRatio", "variance", variance);
  requireFinite("msprtLogLikelihoodRatio", "tau", tau);
  if (variance <= 0) throw new RangeError(`msprtLogLikelihoodRatio requires variance > 0, got ${variance}`);
  if (tau <= 0) throw new RangeError(`msprtLogLikelihoodRatio requires tau > 0, got ${tau}`);
  const tauSquared = tau * tau;
  const total = variance + tauSquared;
  return -0.5 * Math.log1p(tauSquared / variance) + (tauSquared * estimate * estimate) / (2 * variance * total);
}
