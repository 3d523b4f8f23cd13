import type { MetricKind, Sides } from "./types";
import type { SampleSize } from "./sample-size-two-proportions";
import { sampleSizeTwoMeans } from "./sample-size-two-means";
import { sampleSizeTwoProportions } from "./sample-size-two-proportions";
import { widthOptimalTau } from "./width-optimal-tau";

/**
 * The mSPRT's mixing standard deviation τ for a campaign plan: the fixed-horizon sample size n* of
 * the plan, the variance of the lift expected there under the baseline,
 * `V* = s²(1/n_T* + 1/n_C*)` with `s² = baseline(1 − baseline)` (conversion) or the planned σ²
 * (mean), and τ by the width-optimal rule of {@link widthOptimalTau}.
 *
 * Reference: Howard, Ramdas, McAuliffe & Sekhon (2021); DESIGN.md §3. Compute it once when the
 * plan is fixed and store it, so the guarantee does not move once data arrive. Complexity: O(1).
 *
 * @param options.metric - "conversion" or "mean"
 * @param options.baselineRate - baseline rate (conversion, in (0, 1)) or baseline mean (mean metric)
 * @param options.minimumLift - relative lift to detect
 * @param options.significanceLevel - α of the test and of the sequence (per comparison), in (0, 1)
 * @param options.power - in (0, 1)
 * @param options.sides - 1 or 2, for the fixed-horizon n*
 * @param options.holdoutShare - holdout's share of the two arms compared, in (0, 1), default 0.5
 * @param options.standardDeviation - planned σ per unit, required for a mean metric
 * @returns `{ tau, horizonVariance, sampleSize }`
 * @throws RangeError from the sample-size functions, or when a mean metric has no standardDeviation
 * @example tauFromPlan({ metric: "conversion", baselineRate: 0.1, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2 }).tau // ≈ 0.00984
 */
export function tauFromPlan(options: {
  metric: MetricKind;
  baselineRate: number;
  minimumLift: number;
  significanceLevel: number;
  power: number;
  sides: Sides;
  holdoutShare?: number;
  standardDeviation?: number;
}): { tau: number; horizonVariance: number; sampleSize: SampleSize } {
  let sampleSize: SampleSize;
  let unitVariance: number;
  if (options.metric === "mean") {
    if (options.standardDeviation === undefined) throw new RangeError("tauFromPlan requires standardDeviation for a mean metric");
    sampleSize = sampleSizeTwoMeans({ ...options, baselineMean: options.baselineRate, standardDeviation: options.standardDeviation });
    unitVariance = options.standardDeviation ** 2;
  } else if (options.metric === "conversion") {
    sampleSize = sampleSizeTwoProportions(options);
    unitVariance = options.baselineRate * (1 - options.baselineRate);
  } else {
    throw new RangeError(`tauFromPlan requires metric "conversion" or "mean", got ${String(options.metric)}`);
  }
  const horizonVariance = unitVariance * (1 / sampleSize.treatment + 1 / sampleSize.holdout);
  return { tau: widthOptimalTau(horizonVariance, options.significanceLevel), horizonVariance, sampleSize };
}
