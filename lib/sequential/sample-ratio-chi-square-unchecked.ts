/**
 * The arithmetic of {@link sampleRatioChiSquare} without argument checks, for a daily loop that has
 * validated the counts and normalised the shares once.
 *
 * Reference: as {@link sampleRatioChiSquare}. Complexity: O(k).
 *
 * @param counts - units per arm, non-negative integers with a positive total
 * @param shares - planned shares, each > 0, summing exactly to 1
 * @returns the chi-square statistic X² (k − 1 degrees of freedom)
 * @example sampleRatioChiSquareStatistic([5100, 4900], [0.5, 0.5]) // 4
 */
export function sampleRatioChiSquareStatistic(counts: readonly number[], shares: readonly number[]): number {
  let total = 0;
  for (let i = 0; i < counts.length; i++) total += counts[i];
  let statistic = 0;
  for (let i = 0; i < counts.length; i++) {
    const expected = total * shares[i];
    statistic += ((counts[i] - expected) * (counts[i] - expected)) / expected;
  }
  return statistic;
}
