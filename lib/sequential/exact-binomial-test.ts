import { binomialRaw } from "./binomial-probability";
import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";

/** Alternative hypothesis of an exact test. */
export type ExactAlternative = "two-sided" | "greater" | "less";

/**
 * Exact binomial test of `H0: p = probability` for `successes` out of `trials`, for small counts
 * where the normal approximation fails.
 *
 * Two-sided p-value: the total probability of outcomes no more likely than the observed one
 * (relative tolerance 1 + 1e-7, as R's `binom.test` and scipy's `binomtest`). One-sided: the
 * upper (`greater`) or lower (`less`) tail. Masses by Loader's method, summed exactly (no CDF
 * rounding in the tails). Reference: Clopper & Pearson (1934) for the test's logic; R `binom.test`.
 * Complexity: O(trials).
 *
 * @param successes - observed successes, an integer in [0, trials]
 * @param trials - number of trials, a positive integer
 * @param probability - success probability under H0, in (0, 1)
 * @param alternative - "two-sided" (default), "greater" or "less"
 * @returns the p-value in [0, 1]
 * @throws RangeError when the counts are not integers with 0 ≤ successes ≤ trials, trials ≥ 1, or p outside (0, 1)
 * @example exactBinomialTest(7, 20, 0.5) // ≈ 0.2632
 */
export function exactBinomialTest(successes: number, trials: number, probability: number, alternative: ExactAlternative = "two-sided"): number {
  requireFinite("exactBinomialTest", "successes", successes);
  requireFinite("exactBinomialTest", "trials", trials);
  if (!Number.isInteger(trials) || trials < 1) throw new RangeError(`exactBinomialTest requires trials to be a positive integer, got ${trials}`);
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(`exactBinomialTest requires successes to be an integer in [0, trials], got ${successes}`);
  }
  requireProbability("exactBinomialTest", "probability", probability);
  const q = 1 - probability;
  const mass = (k: number) => binomialRaw(k, trials, probability, q);
  if (alternative === "greater") return sumMasses(successes, trials, mass);
  if (alternative === "less") return sumMasses(0, successes, mass);
  if (alternative !== "two-sided") throw new RangeError(`exactBinomialTest requires alternative "two-sided", "greater" or "less", got ${String(alternative)}`);
  const observed = mass(successes) * (1 + 1e-7);
  let total = 0;
  for (let k = 0; k <= trials; k++) {
    const value = mass(k);
    if (value <= observed) total += value;
  }
  return Math.min(1, total);
}

function sumMasses(from: number, to: number, mass: (k: number) => number): number {
  let total = 0;
  for (let k = to; k >= from; k--) total += mass(k);
  return Math.min(1, total);
}
