import { binomialRaw } from "./binomial-probability";
import { requireFinite } from "./require-finite";

/**
 * Hypergeometric probability mass: drawing `drawn` balls from an urn of `white` white and `black`
 * black balls, the chance of exactly `x` white ones. Written as a ratio of binomial masses at
 * `p = drawn/(white + black)`, which keeps full precision in the tails.
 *
 * Reference: R's `dhyper` (the same ratio of Loader's binomial terms); Loader (2000).
 * Complexity: O(1).
 *
 * @param x - white balls drawn, an integer (outside the support gives 0)
 * @param white - white balls in the urn, a non-negative integer
 * @param black - black balls in the urn, a non-negative integer
 * @param drawn - balls drawn, an integer in [0, white + black]
 * @returns P(X = x) in [0, 1]
 * @throws RangeError when a count is not a non-negative integer or drawn exceeds the urn
 * @example hypergeometricProbability(1, 5, 5, 2) // ≈ 0.5556 (= 25/45)
 */
export function hypergeometricProbability(x: number, white: number, black: number, drawn: number): number {
  for (const [name, value] of [["x", x], ["white", white], ["black", black], ["drawn", drawn]] as const) {
    requireFinite("hypergeometricProbability", name, value);
    if (!Number.isInteger(value)) throw new RangeError(`hypergeometricProbability requires ${name} to be an integer, got ${value}`);
  }
  if (white < 0 || black < 0 || drawn < 0 || drawn > white + black) {
    throw new RangeError(`hypergeometricProbability requires non-negative counts with drawn ≤ white + black, got ${white}, ${black}, ${drawn}`);
  }
  if (x < 0 || x < drawn - black || x > white || x > drawn) return 0;
  if (drawn === 0) return x === 0 ? 1 : 0;
  const total = white + black;
  const p = drawn / total;
  const q = (total - drawn) / total;
  return (binomialRaw(x, white, p, q) * binomialRaw(drawn - x, black, p, q)) / binomialRaw(drawn, total, p, q);
}
