import type { Interval } from "./types";
import { alwaysValidSequenceArrays } from "./always-valid-sequence-arrays";

/** One look: the estimate and its variance, or null when the look has nothing to estimate. */
export type SequenceLook = { readonly estimate: number; readonly variance: number } | null;

/** The always-valid p-value and confidence sequence after one look. */
export interface SequenceStep {
  /** Always-valid p-value, non-increasing over looks. */
  readonly p: number;
  /** Running intersection of the confidence sets, never widening; ±Infinity before the first estimable look. */
  readonly cs: Interval;
}

/**
 * Runs the mSPRT over a series of looks: always-valid p-value `p_t = min(1, p_{t−1}, 1/Λ_t)` and the
 * confidence sequence `Δ_t ± h_t`, intersected with every earlier one (so it never widens).
 * A null look (not estimable yet, e.g. zero variance) repeats the previous step. Uses the closed forms of
 * {@link msprtLogLikelihoodRatio} and {@link confidenceSequenceHalfWidth} (via {@link alwaysValidSequenceArrays}).
 *
 * Reference: Johari, Koomen, Pekelis & Walsh (2022), *Operations Research* 70(3) (the running
 * minimum and intersection keep the guarantee: P(∃t: θ ∉ CS_t) ≤ α). Two-sided by construction.
 * Complexity: O(looks).
 *
 * @param looks - the looks in time order; each `{ estimate, variance > 0 }` or null
 * @param options.tau - τ > 0, mixing standard deviation in the units of the estimate
 * @param options.significanceLevel - α in (0, 1)
 * @returns one {@link SequenceStep} per look
 * @throws RangeError when τ ≤ 0, α outside (0, 1), or a look has a non-finite estimate or variance ≤ 0
 * @example alwaysValidSequence([{ estimate: 0.5, variance: 0.01 }], { tau: 0.2, significanceLevel: 0.05 })[0].p // ≈ 1.015e-4
 */
export function alwaysValidSequence(looks: readonly SequenceLook[], options: { tau: number; significanceLevel: number }): SequenceStep[] {
  const estimates = new Float64Array(looks.length);
  const variances = new Float64Array(looks.length);
  looks.forEach((look, i) => {
    if (look === null) return;
    if (!(look.variance > 0)) throw new RangeError(`alwaysValidSequence requires each look to have a finite estimate and a variance > 0, got ${look.estimate} and ${look.variance} at look ${i}`);
    estimates[i] = look.estimate;
    variances[i] = look.variance;
  });
  const result = alwaysValidSequenceArrays(estimates, variances, options);
  return Array.from(result.p, (p, i) => ({ p, cs: [result.lower[i], result.upper[i]] as Interval }));
}
