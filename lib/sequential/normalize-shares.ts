import { requireFinite } from "./require-finite";

/**
 * Argument guard and normalisation for planned allocation shares: each share > 0 and the shares
 * summing to 1 within 1e-6; returns them divided by their sum.
 *
 * Reference: none (input validation). Complexity: O(k).
 *
 * @param functionName - the public function whose rule is broken, named in the message
 * @param shares - k ≥ 2 planned shares
 * @returns the shares rescaled to sum exactly to 1
 * @throws RangeError when fewer than 2 shares, a share ≤ 0, or the sum is off by more than 1e-6
 * @example normalizeShares("sampleRatioChiSquare", [0.9, 0.1]) // [0.9, 0.1]
 */
export function normalizeShares(functionName: string, shares: readonly number[]): number[] {
  if (!Array.isArray(shares) || shares.length < 2) throw new RangeError(`${functionName} requires at least 2 shares`);
  let sum = 0;
  for (const share of shares) {
    requireFinite(functionName, "a share", share);
    if (share <= 0) throw new RangeError(`${functionName} requires every share > 0, got ${share}`);
    sum += share;
  }
  if (Math.abs(sum - 1) > 1e-6) throw new RangeError(`${functionName} requires shares summing to 1, got ${sum}`);
  return shares.map((share) => share / sum);
}
