import { chiSquareSurvival } from "./chi-square-survival";
import { normalizeShares } from "./normalize-shares";
import { requireCounts } from "./require-counts";
import { sampleRatioChiSquareStatistic } from "./sample-ratio-chi-square-unchecked";

/**
 * Sample-ratio mismatch (SRM) check by Pearson's chi-square goodness-of-fit test of the units per
 * arm against the planned shares: `X² = Σ (n_i − N s_i)² / (N s_i)` on k − 1 degrees of freedom.
 *
 * Reference: Pearson (1900); as scipy `stats.chisquare(f_obs, f_exp)`. Kohavi, Tang & Xu (2020),
 * *Trustworthy Online Controlled Experiments*, ch. 21, treat SRM as a gate with a small threshold;
 * the product uses p < 0.001 (see {@link analyzeCampaign}). Valid at one look; the anytime-valid
 * counterpart is {@link dirichletMultinomialLogBayesFactor}. Complexity: O(k).
 *
 * @param counts - units per arm, non-negative integers, at least one positive
 * @param shares - planned shares per arm, each > 0, summing to 1
 * @returns `{ statistic, p, degreesOfFreedom }`
 * @throws RangeError when counts and shares differ in length, a count is invalid, all counts are 0, or the shares are invalid
 * @example sampleRatioChiSquare([5100, 4900], [0.5, 0.5]).p // ≈ 0.0455
 */
export function sampleRatioChiSquare(counts: readonly number[], shares: readonly number[]): { statistic: number; p: number; degreesOfFreedom: number } {
  const normalized = normalizeShares("sampleRatioChiSquare", shares);
  requireCounts("sampleRatioChiSquare", counts, normalized.length);
  const total = counts.reduce((sum, count) => sum + count, 0);
  if (total === 0) throw new RangeError("sampleRatioChiSquare requires at least one unit");
  const statistic = sampleRatioChiSquareStatistic(counts, normalized);
  const degreesOfFreedom = counts.length - 1;
  return { statistic, p: chiSquareSurvival(statistic, degreesOfFreedom), degreesOfFreedom };
}
