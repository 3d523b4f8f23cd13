import type { ArmTotals, Interval, MetricKind, Sides } from "./types";
import type { LiftEstimate } from "./lift-estimate";
import type { TwoSampleZTestResult } from "./two-sample-z-test";
import { liftEstimateUnchecked } from "./lift-estimate-unchecked";
import { zTestPValue } from "./z-test-p-value";

/**
 * The arithmetic of {@link twoSampleZTest} without argument checks, with the interval's normal
 * quantile passed in (so a daily loop computes it once). The one code path behind both the
 * public test and {@link analyzeCampaign}.
 *
 * Reference: as {@link twoSampleZTest}. Complexity: O(1).
 *
 * @param treatment - valid, estimable totals of the treatment arm
 * @param holdout - valid, estimable totals of the holdout arm
 * @param metric - "conversion" or "mean"
 * @param sides - 1 or 2
 * @param quantile - Φ⁻¹(1 − α/sides) for the intervals
 * @returns the test result plus the {@link LiftEstimate} it used
 * @example twoSampleZTestUnchecked({ n: 1000, sum: 120, sumSq: 120 }, { n: 1000, sum: 100, sumSq: 100 }, "conversion", 2, 1.959963984540054).pooled.z // ≈ 1.4293
 */
export function twoSampleZTestUnchecked(
  treatment: ArmTotals,
  holdout: ArmTotals,
  metric: MetricKind,
  sides: Sides,
  quantile: number,
): TwoSampleZTestResult & { lift: LiftEstimate } {
  const lift = liftEstimateUnchecked(treatment, holdout, metric);
  let pooledVariance: number;
  if (metric === "conversion") {
    const rate = (treatment.sum + holdout.sum) / (treatment.n + holdout.n);
    pooledVariance = rate * (1 - rate) * (1 / treatment.n + 1 / holdout.n);
  } else {
    const squaresT = treatment.sumSq - (treatment.sum * treatment.sum) / treatment.n;
    const squaresC = holdout.sumSq - (holdout.sum * holdout.sum) / holdout.n;
    pooledVariance = Math.max(0, (squaresT + squaresC) / (treatment.n + holdout.n - 2)) * (1 / treatment.n + 1 / holdout.n);
  }
  const zPooled = ratioOrSign(lift.absolute, Math.sqrt(pooledVariance));
  const unpooledSe = Math.sqrt(lift.variance);
  const zUnpooled = ratioOrSign(lift.absolute, unpooledSe);
  const half = quantile * unpooledSe;
  const absolute: Interval = sides === 2 ? [lift.absolute - half, lift.absolute + half] : [lift.absolute - half, Infinity];
  let relative: Interval | null = null;
  if (lift.logRatio !== null && lift.logRatioVariance !== null) {
    const logHalf = quantile * Math.sqrt(lift.logRatioVariance);
    relative = [Math.expm1(lift.logRatio - logHalf), sides === 2 ? Math.expm1(lift.logRatio + logHalf) : Infinity];
  }
  return {
    absolute: lift.absolute,
    relative: lift.relative,
    pooled: { z: zPooled, p: zTestPValue(zPooled, sides) },
    unpooled: { z: zUnpooled, p: zTestPValue(zUnpooled, sides) },
    ci: { absolute, relative },
    lift,
  };
}

/** z = numerator/SE; with SE = 0 it is 0 for a zero lift and ±Infinity otherwise. */
function ratioOrSign(numerator: number, denominator: number): number {
  if (denominator > 0) return numerator / denominator;
  return numerator === 0 ? 0 : numerator > 0 ? Infinity : -Infinity;
}
