/**
 * Root of a continuous decreasing function on a bracket [low, high] with f(low) ≥ 0 ≥ f(high),
 * by the Illinois variant of regula falsi (superlinear, never leaves the bracket). Used to solve
 * for group-sequential boundary constants.
 *
 * Reference: Dowell & Jarratt (1971), "A modified regula falsi method for computing the root of
 * an equation", *BIT* 11, 168–174, https://doi.org/10.1007/BF01934364.
 * Complexity: O(n) evaluations of f, typically n ≈ 8–15 for a tolerance of 1e-12.
 *
 * @param f - the function, decreasing on [low, high]
 * @param low - left end, finite, below high
 * @param high - right end, finite
 * @param tolerance - absolute tolerance on the root, > 0 (default 1e-11)
 * @returns x in [low, high] with f(x) ≈ 0; low or high when f does not change sign (the nearer end)
 * @throws RangeError when the bracket is not finite with low < high, or tolerance is not > 0
 * @example solveDecreasing((x) => 2 - x * x, 0, 2) // ≈ 1.414213562
 */
export function solveDecreasing(f: (x: number) => number, low: number, high: number, tolerance = 1e-11): number {
  if (!(Number.isFinite(low) && Number.isFinite(high) && low < high)) {
    throw new RangeError(`solveDecreasing requires a finite bracket low < high, got [${low}, ${high}]`);
  }
  if (!(tolerance > 0)) throw new RangeError(`solveDecreasing requires a tolerance > 0, got ${tolerance}`);
  let a = low;
  let b = high;
  let fa = f(a);
  let fb = f(b);
  if (fa <= 0) return a;
  if (fb >= 0) return b;
  let side = 0;
  for (let iteration = 0; iteration < 200 && b - a > tolerance; iteration += 1) {
    const c = (a * fb - b * fa) / (fb - fa);
    const fc = f(c);
    if (fc === 0) return c;
    if (fc > 0) {
      a = c;
      fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    } else {
      b = c;
      fb = fc;
      if (side === -1) fa /= 2;
      side = -1;
    }
    if (Math.abs(fc) < 1e-15) return c;
  }
  return 0.5 * (a + b);
}
