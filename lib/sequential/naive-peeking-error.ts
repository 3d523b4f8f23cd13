import { normalQuantile } from "./normal-distribution";
import { crossingProbabilities } from "./recursive-integration-crossing";

/** Options of the naive repeated test: the nominal level used at every look and its sidedness. */
export interface NaivePeekingOptions {
  /** nominal significance level α of each look's fixed-horizon test, in (0, 1); default 0.05 */
  significanceLevel?: number;
  /** 2 (default): reject when |Z| ≥ z₁₋α/₂; 1: reject when Z ≥ z₁₋α */
  sides?: 1 | 2;
}

/**
 * Cost of peeking, look by look: the cumulative probability, under no effect, that a naive
 * fixed-level z-test repeated at each look has rejected at least once by that look. The first
 * value is the nominal level itself; the last is {@link naivePeekingError}. One pass of the
 * recursion gives every look.
 *
 * This is the repeated-significance-test error of Armitage, McPherson & Rowe, computed exactly
 * (to quadrature accuracy, about 1e-8 for 100 looks) by recursive numerical integration, not by
 * simulation. Accuracy holds while consecutive looks differ by Δt/t ≥ about 2e-6 (see
 * recursive-integration-resolution.ts); looks closer than that should be merged by the caller.
 *
 * Reference: Armitage, McPherson & Rowe (1969), "Repeated significance tests on accumulating
 * data", *JRSS A* 132, 235–244, https://doi.org/10.2307/2343787; Jennison & Turnbull (2000),
 * *Group Sequential Methods with Applications to Clinical Trials*, Table 1.1 and ch. 19.
 * Assumes the canonical joint distribution: the z statistics at the looks are those of one
 * Brownian motion, corr(Z_i, Z_j) = √(t_i/t_j) (large samples, known variance, no effect).
 * Complexity: O(K·m·w), K looks, m ≈ 85–170 grid nodes, w ≤ m nodes within the kernel's reach;
 * O(K) for inputs seen before: the curve is a function of the level, the sides and the fractions
 * alone, so the last 256 curves are kept under their exact inputs (campaigns whose days carry equal
 * shares of their traffic share one curve).
 *
 * @param informationFractions - the looks' information fractions n_k/n*, strictly increasing in
 *   (0, 1]; only their ratios matter, so looks past the planned horizon can be divided by the last one
 * @param options - nominal level (default 0.05) and sides (default 2)
 * @returns the cumulative error after each look, non-decreasing, each in [α, 1)
 * @throws RangeError when the fractions are empty, not finite, not strictly increasing or outside
 *   (0, 1]; when significanceLevel is outside (0, 1); when sides is not 1 or 2
 * @example naivePeekingErrorByLook([0.5, 1]) // ≈ [0.05, 0.0831]
 */
export function naivePeekingErrorByLook(
  informationFractions: readonly number[],
  options: NaivePeekingOptions = {},
): number[] {
  const { significanceLevel = 0.05, sides = 2 } = options;
  validateFractions("naivePeekingErrorByLook", informationFractions);
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`naivePeekingErrorByLook requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`naivePeekingErrorByLook requires sides 1 or 2, got ${String(sides)}`);
  }
  // The curve depends on nothing but the level, the sides and the fractions: equal inputs, equal curve.
  const key = `${significanceLevel}|${sides}|${informationFractions.join(",")}`;
  const known = curveMemo.get(key);
  if (known !== undefined) return known.slice();
  const critical = normalQuantile(1 - significanceLevel / sides);
  const upper = informationFractions.map(() => critical);
  const lower = sides === 2 ? "symmetric" : informationFractions.map(() => -Infinity);
  const cumulative = crossingProbabilities(informationFractions, upper, lower).total;
  cumulative[0] = significanceLevel;
  if (curveMemo.size >= CURVE_MEMO_SIZE) curveMemo.delete(curveMemo.keys().next().value as string);
  curveMemo.set(key, cumulative.slice());
  return cumulative;
}

/** Curves kept by exact inputs (the key is the full-precision fractions, so a hit is the same result). */
const CURVE_MEMO_SIZE = 256;
const curveMemo = new Map<string, number[]>();

/**
 * Cost of peeking: the probability, under no effect, that a naive fixed-level z-test repeated at
 * every look of the schedule rejects at least once — the false-positive rate a daily peeker
 * really runs. Equals the nominal level at one look and grows with every added look
 * (≈ 0.083 at 2 equally spaced looks, 0.193 at 10, 0.374 at 100, for α = 0.05 two-sided).
 *
 * Reference: Armitage, McPherson & Rowe (1969), *JRSS A* 132, 235–244,
 * https://doi.org/10.2307/2343787; Jennison & Turnbull (2000), Table 1.1 and ch. 19 (recursive
 * numerical integration). Assumes the canonical joint distribution corr(Z_i, Z_j) = √(t_i/t_j).
 * Complexity: as {@link naivePeekingErrorByLook}; 100 looks take a few milliseconds.
 *
 * @param informationFractions - strictly increasing in (0, 1]; only their ratios matter
 * @param options - nominal level (default 0.05) and sides (default 2)
 * @returns the probability in [α, 1) that at least one look rejects
 * @throws RangeError as {@link naivePeekingErrorByLook} (with this function's name)
 * @example naivePeekingError([0.2, 0.4, 0.6, 0.8, 1]) // ≈ 0.1417
 */
export function naivePeekingError(informationFractions: readonly number[], options: NaivePeekingOptions = {}): number {
  validateFractions("naivePeekingError", informationFractions);
  const { significanceLevel = 0.05, sides = 2 } = options;
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`naivePeekingError requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`naivePeekingError requires sides 1 or 2, got ${String(sides)}`);
  }
  const cumulative = naivePeekingErrorByLook(informationFractions, { significanceLevel, sides });
  return cumulative[cumulative.length - 1];
}

function validateFractions(name: string, fractions: readonly number[]): void {
  if (!Array.isArray(fractions) || fractions.length === 0) {
    throw new RangeError(`${name} requires at least one information fraction`);
  }
  let before = 0;
  for (const fraction of fractions) {
    if (!(typeof fraction === "number" && Number.isFinite(fraction) && fraction > before && fraction <= 1)) {
      throw new RangeError(`${name} requires strictly increasing information fractions in (0, 1], got ${fraction}`);
    }
    before = fraction;
  }
}
