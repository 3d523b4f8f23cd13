import { requireProbability } from "./require-probability";

/**
 * Bonferroni-adjusted level α/k for each of k comparisons (treatment arms against the holdout), so
 * the chance of any false call across them stays ≤ α.
 *
 * Reference: Dunn (1961), *JASA* 56; valid under any dependence between the arms. Complexity: O(1).
 *
 * @param significanceLevel - overall α in (0, 1)
 * @param comparisons - k, a positive integer
 * @returns α/k
 * @throws RangeError when α is outside (0, 1) or k is not a positive integer
 * @example bonferroniLevel(0.05, 2) // 0.025
 */
export function bonferroniLevel(significanceLevel: number, comparisons: number): number {
  requireProbability("bonferroniLevel", "significanceLevel", significanceLevel);
  if (!Number.isInteger(comparisons) || comparisons < 1) {
    throw new RangeError(`bonferroniLevel requires comparisons to be a positive integer, got ${comparisons}`);
  }
  return significanceLevel / comparisons;
}
