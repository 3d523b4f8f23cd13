import type { ArmTotals, MetricKind } from "./types";
import { requireEstimableArm } from "./require-estimable-arm";
import { createZTestScratch, twoSampleZTestUnchecked } from "./two-sample-z-test-unchecked";

/** The lift of a treatment over the holdout, with the variances the tests and intervals need. */
export interface LiftEstimate {
  readonly treatmentMean: number;
  readonly holdoutMean: number;
  /** Δ = m_T − m_C. */
  readonly absolute: number;
  /** V = s_T²/n_T + s_C²/n_C, the unpooled variance of Δ. */
  readonly variance: number;
  /** m_T/m_C − 1, or null when a mean is not positive. */
  readonly relative: number | null;
  /** log(m_T/m_C), or null when a mean is not positive. */
  readonly logRatio: number | null;
  /** Delta-method variance of log(m_T/m_C): s_T²/(n_T m_T²) + s_C²/(n_C m_C²), or null. */
  readonly logRatioVariance: number | null;
}

/**
 * Absolute and relative lift of a treatment over the holdout from sufficient statistics, with the
 * unpooled variance of the absolute lift and the delta-method variance of the log ratio.
 *
 * Reference: DESIGN.md §3; delta method as in statsmodels
 * `confint_proportions_2indep(compare="ratio", method="log")` (for proportions
 * var = 1/x_T − 1/n_T + 1/x_C − 1/n_C). Assumes independent units; normal approximation.
 * Complexity: O(1).
 *
 * @param treatment - cumulative `{ n, sum, sumSq }` of the treatment arm
 * @param holdout - cumulative `{ n, sum, sumSq }` of the holdout arm
 * @param metric - "conversion" or "mean"
 * @returns the {@link LiftEstimate}; the relative fields are null when either mean is ≤ 0
 * @throws RangeError when either arm is invalid or too small (n ≥ 1 conversion, n ≥ 2 mean)
 * @example liftEstimate({ n: 1000, sum: 120, sumSq: 120 }, { n: 1000, sum: 100, sumSq: 100 }, "conversion").absolute // ≈ 0.02
 */
export function liftEstimate(treatment: ArmTotals, holdout: ArmTotals, metric: MetricKind): LiftEstimate {
  requireEstimableArm("liftEstimate", "treatment", treatment, metric);
  requireEstimableArm("liftEstimate", "holdout", holdout, metric);
  const test = twoSampleZTestUnchecked(createZTestScratch(), treatment, holdout, metric, 2, 0);
  return {
    treatmentMean: test.treatmentMean,
    holdoutMean: test.holdoutMean,
    absolute: test.absolute,
    variance: test.variance,
    relative: test.ratioDefined ? Math.expm1(test.logRatio) : null,
    logRatio: test.ratioDefined ? test.logRatio : null,
    logRatioVariance: test.ratioDefined ? test.logRatioVariance : null,
  };
}
