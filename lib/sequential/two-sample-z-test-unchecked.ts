import type { ArmTotals, MetricKind, Sides } from "./types";
import { zTestPValue } from "./z-test-p-value";

/** Mutable scratch record filled by {@link twoSampleZTestUnchecked}; NaN-free (null-like fields use `defined` flags). */
export interface ZTestScratch {
  treatmentMean: number;
  holdoutMean: number;
  absolute: number;
  /** Unpooled variance of the absolute lift. */
  variance: number;
  zPooled: number;
  pPooled: number;
  zUnpooled: number;
  lower: number;
  upper: number;
  /** True when both means are > 0, so the log-ratio fields below hold numbers. */
  ratioDefined: boolean;
  logRatio: number;
  logRatioVariance: number;
  relativeLower: number;
  relativeUpper: number;
}

/**
 * A fresh scratch record for {@link twoSampleZTestUnchecked}, so a loop can reuse one record.
 *
 * Reference: none (a plain record). Complexity: O(1).
 *
 * @returns a record with every number 0 (p 1) and `ratioDefined` false
 * @example createZTestScratch().pPooled // 1
 */
export function createZTestScratch(): ZTestScratch {
  return {
    treatmentMean: 0, holdoutMean: 0, absolute: 0, variance: 0, zPooled: 0, pPooled: 1, zUnpooled: 0,
    lower: 0, upper: 0, ratioDefined: false, logRatio: 0, logRatioVariance: 0, relativeLower: 0, relativeUpper: 0,
  };
}

/**
 * The arithmetic of {@link twoSampleZTest} and {@link liftEstimate} without argument checks, written
 * into a reusable scratch record (a daily loop over many campaigns allocates nothing here) with the
 * interval's normal quantile passed in. The one code path behind the public test, the lift estimate
 * and {@link analyzeCampaign}. The unpooled p-value is left to the caller (it is not a daily number).
 *
 * Reference: as {@link twoSampleZTest}. Complexity: O(1).
 *
 * @param scratch - the record to fill (see {@link createZTestScratch})
 * @param treatment - valid, estimable totals of the treatment arm (n ≥ 1, or ≥ 2 for a mean metric)
 * @param holdout - valid, estimable totals of the holdout arm
 * @param metric - "conversion" or "mean"
 * @param sides - 1 or 2
 * @param quantile - Φ⁻¹(1 − α/sides) for the intervals
 * @returns the same scratch record
 * @example twoSampleZTestUnchecked(createZTestScratch(), { n: 1000, sum: 120, sumSq: 120 }, { n: 1000, sum: 100, sumSq: 100 }, "conversion", 2, 1.959963984540054).zPooled // ≈ 1.4293
 */
export function twoSampleZTestUnchecked(
  scratch: ZTestScratch,
  treatment: ArmTotals,
  holdout: ArmTotals,
  metric: MetricKind,
  sides: Sides,
  quantile: number,
): ZTestScratch {
  const treatmentMean = treatment.sum / treatment.n;
  const holdoutMean = holdout.sum / holdout.n;
  let treatmentVariance: number;
  let holdoutVariance: number;
  let pooledVariance: number;
  if (metric === "conversion") {
    treatmentVariance = treatmentMean * (1 - treatmentMean);
    holdoutVariance = holdoutMean * (1 - holdoutMean);
    const rate = (treatment.sum + holdout.sum) / (treatment.n + holdout.n);
    pooledVariance = rate * (1 - rate) * (1 / treatment.n + 1 / holdout.n);
  } else {
    const squaresT = Math.max(0, treatment.sumSq - treatment.sum * treatmentMean);
    const squaresC = Math.max(0, holdout.sumSq - holdout.sum * holdoutMean);
    treatmentVariance = squaresT / (treatment.n - 1);
    holdoutVariance = squaresC / (holdout.n - 1);
    pooledVariance = ((squaresT + squaresC) / (treatment.n + holdout.n - 2)) * (1 / treatment.n + 1 / holdout.n);
  }
  const absolute = treatmentMean - holdoutMean;
  const variance = treatmentVariance / treatment.n + holdoutVariance / holdout.n;
  const unpooledSe = Math.sqrt(variance);
  scratch.treatmentMean = treatmentMean;
  scratch.holdoutMean = holdoutMean;
  scratch.absolute = absolute;
  scratch.variance = variance;
  scratch.zPooled = ratioOrSign(absolute, Math.sqrt(pooledVariance));
  scratch.pPooled = zTestPValue(scratch.zPooled, sides);
  scratch.zUnpooled = ratioOrSign(absolute, unpooledSe);
  scratch.lower = absolute - quantile * unpooledSe;
  scratch.upper = sides === 2 ? absolute + quantile * unpooledSe : Infinity;
  scratch.ratioDefined = treatmentMean > 0 && holdoutMean > 0;
  if (scratch.ratioDefined) {
    const logRatio = Math.log(treatmentMean / holdoutMean);
    const logRatioVariance = treatmentVariance / (treatment.n * treatmentMean * treatmentMean) + holdoutVariance / (holdout.n * holdoutMean * holdoutMean);
    const logHalf = quantile * Math.sqrt(logRatioVariance);
    scratch.logRatio = logRatio;
    scratch.logRatioVariance = logRatioVariance;
    scratch.relativeLower = Math.expm1(logRatio - logHalf);
    scratch.relativeUpper = sides === 2 ? Math.expm1(logRatio + logHalf) : Infinity;
  }
  return scratch;
}

/** z = numerator/SE; with SE = 0 it is 0 for a zero lift and ±Infinity otherwise. */
function ratioOrSign(numerator: number, denominator: number): number {
  if (denominator > 0) return numerator / denominator;
  return numerator === 0 ? 0 : numerator > 0 ? Infinity : -Infinity;
}
