/**
 * Equally spaced information fractions for a design with a given number of looks:
 * [1/K, 2/K, …, 1], the schedule of a classic group-sequential design with equal group sizes.
 *
 * Reference: Jennison & Turnbull (2000), *Group Sequential Methods with Applications to Clinical
 * Trials*, §2.1 (equally sized groups). The last fraction is exactly 1.
 * Complexity: O(K) time and memory.
 *
 * @param looks - the number of looks K, an integer ≥ 1
 * @returns the K fractions k/K, strictly increasing, ending at 1
 * @throws RangeError when looks is not an integer ≥ 1
 * @example equalFractions(4) // [0.25, 0.5, 0.75, 1]
 */
export function equalFractions(looks: number): number[] {
  if (!Number.isInteger(looks) || looks < 1) {
    throw new RangeError(`equalFractions requires an integer number of looks ≥ 1, got ${looks}`);
  }
  return Array.from({ length: looks }, (_, index) => (index + 1 === looks ? 1 : (index + 1) / looks));
}
