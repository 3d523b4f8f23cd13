import { logGamma } from "./log-gamma";

/**
 * The arithmetic of {@link dirichletMultinomialLogBayesFactor} without argument checks, for a daily
 * loop that has validated the counts and normalised the shares once.
 *
 * Reference: as {@link dirichletMultinomialLogBayesFactor}. Complexity: O(k).
 *
 * @param counts - cumulative units per arm, non-negative integers
 * @param shares - planned shares, each > 0, summing exactly to 1
 * @param priorStrength - Dirichlet concentration > 0
 * @returns log BF
 * @example dirichletMultinomialLogBayesFactorUnchecked([0, 0], [0.5, 0.5], 100) // 0
 */
export function dirichletMultinomialLogBayesFactorUnchecked(counts: readonly number[], shares: readonly number[], priorStrength: number): number {
  let total = 0;
  let logBayesFactor = 0;
  for (let i = 0; i < counts.length; i++) {
    const count = counts[i];
    if (count > 0) {
      const prior = priorStrength * shares[i];
      logBayesFactor += logGamma(prior + count) - logGamma(prior) - count * Math.log(shares[i]);
      total += count;
    }
  }
  if (total > 0) logBayesFactor -= logGamma(priorStrength + total) - logGamma(priorStrength);
  return logBayesFactor;
}
