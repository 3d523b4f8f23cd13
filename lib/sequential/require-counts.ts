/**
 * Argument guard for arm counts: an array of non-negative integers of the expected length.
 *
 * Reference: none (input validation). Complexity: O(k).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param counts - the counts
 * @param length - the expected number of counts (one per share)
 * @returns nothing
 * @throws RangeError when the length differs or a count is not a non-negative integer
 * @example requireCounts("sampleRatioChiSquare", [50, 50], 2) // passes
 */
export function requireCounts(functionName: string, counts: readonly number[], length: number): void {
  if (!Array.isArray(counts) || counts.length !== length) {
    throw new RangeError(`${functionName} requires one count per share (${length}), got ${Array.isArray(counts) ? counts.length : "none"}`);
  }
  for (const count of counts) {
    if (typeof count !== "number" || !Number.isInteger(count) || count < 0) {
      throw new RangeError(`${functionName} requires counts to be non-negative integers, got ${String(count)}`);
    }
  }
}
