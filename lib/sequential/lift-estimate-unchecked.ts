import type { ArmTotals, MetricKind } from "./types";
import type { LiftEstimate } from "./lift-estimate";

/**
 * The arithmetic of {@link liftEstimate} without its argument checks, for loops that have already
 * validated the totals (n ≥ 1 for a conversion metric, n ≥ 2 for a mean metric, valid totals).
 *
 * Reference: as {@link liftEstimate}. Complexity: O(1).
 *
 * @param treatment - valid cumulative totals of the treatment arm
 * @param holdout - valid cumulative totals of the holdout arm
 * @param metric - "conversion" or "mean"
 * @returns the {@link LiftEstimate}
 * @example liftEstimateUnchecked({ n: 10, sum: 2, sumSq: 2 }, { n: 10, sum: 1, sumSq: 1 }, "conversion").absolute // 0.1
 */
export function liftEstimateUnchecked(treatment: ArmTotals, holdout: ArmTotals, metric: MetricKind): LiftEstimate {
  const treatmentMean = treatment.sum / treatment.n;
  const holdoutMean = holdout.sum / holdout.n;
  let treatmentVariance: number;
  let holdoutVariance: number;
  if (metric === "conversion") {
    treatmentVariance = treatmentMean * (1 - treatmentMean);
    holdoutVariance = holdoutMean * (1 - holdoutMean);
  } else {
    treatmentVariance = Math.max(0, (treatment.sumSq - treatment.sum * treatmentMean) / (treatment.n - 1));
    holdoutVariance = Math.max(0, (holdout.sumSq - holdout.sum * holdoutMean) / (holdout.n - 1));
  }
  const ratioDefined = treatmentMean > 0 && holdoutMean > 0;
  const logRatio = ratioDefined ? Math.log(treatmentMean / holdoutMean) : null;
  return {
    treatmentMean,
    holdoutMean,
    absolute: treatmentMean - holdoutMean,
    variance: treatmentVariance / treatment.n + holdoutVariance / holdout.n,
    relative: logRatio === null ? null : Math.expm1(logRatio),
    logRatio,
    logRatioVariance: ratioDefined
      ? treatmentVariance / (treatment.n * treatmentMean * treatmentMean) + holdoutVariance / (holdout.n * holdoutMean * holdoutMean)
      : null,
  };
}
