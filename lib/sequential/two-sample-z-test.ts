import type { ArmTotals, Interval, MetricKind, Sides } from "./types";
import { requireEstimableArm } from "./require-estimable-arm";
import { createZTestScratch, twoSampleZTestUnchecked } from "./two-sample-z-test-unchecked";
import { zTestPValue } from "./z-test-p-value";
import { normalQuantile } from "./normal-distribution";
import { requireProbability } from "./require-probability";
import { requireSides } from "./require-sides";

/** Result of {@link twoSampleZTest}. */
export interface TwoSampleZTestResult {
  readonly absolute: number;
  readonly relative: number | null;
  /** Test statistic with the pooled standard error (the classic test of H0: equal means). */
  readonly pooled: { readonly z: number; readonly p: number };
  /** Test statistic with the unpooled (Wald / Welch-type) standard error. */
  readonly unpooled: { readonly z: number; readonly p: number };
  readonly ci: { readonly absolute: Interval; readonly relative: Interval | null };
}

/**
 * Fixed-horizon two-sample z-test of treatment against holdout, with intervals for the absolute
 * and the relative lift.
 *
 * Conversion metric: pooled SE `sqrt(p̄(1 − p̄)(1/n_T + 1/n_C))` for the test (R `prop.test(correct =
 * FALSE)`, statsmodels `proportions_ztest`), unpooled SE `sqrt(p_T q_T/n_T + p_C q_C/n_C)` for the
 * Wald interval. Mean metric: pooled SE from the pooled sample variance (statsmodels
 * `ztest(usevar="pooled")`), unpooled Welch-type SE `sqrt(s_T²/n_T + s_C²/n_C)` (`usevar="unequal"`).
 * The relative interval is `exp(log(m_T/m_C) ± q·se_log) − 1` by the delta method (statsmodels
 * `confint_proportions_2indep(compare="ratio", method="log")`). One-sided means treatment > holdout:
 * the intervals are then lower bounds `[lo, Infinity]`. Valid only at the planned horizon;
 * before it the same numbers are the "naive peek". With a zero standard error z is 0 when the
 * lift is 0 and ±Infinity otherwise.
 * Complexity: O(1).
 *
 * @param treatment - cumulative `{ n, sum, sumSq }` of the treatment arm
 * @param holdout - cumulative `{ n, sum, sumSq }` of the holdout arm
 * @param options - `metric` (default "conversion"), `sides` (default 2), `significanceLevel` α for the
 *   intervals, in (0, 1), default 0.05
 * @returns pooled and unpooled `{ z, p }` and the intervals; `ci.relative` is null when a mean is ≤ 0
 * @throws RangeError when an arm is invalid or too small, sides is not 1 or 2, or α is outside (0, 1)
 * @example twoSampleZTest({ n: 1000, sum: 120, sumSq: 120 }, { n: 1000, sum: 100, sumSq: 100 }).pooled.z // ≈ 1.4293
 */
export function twoSampleZTest(
  treatment: ArmTotals,
  holdout: ArmTotals,
  options: { metric?: MetricKind; sides?: Sides; significanceLevel?: number } = {},
): TwoSampleZTestResult {
  const metric = options.metric ?? "conversion";
  const sides = options.sides ?? 2;
  const significanceLevel = options.significanceLevel ?? 0.05;
  requireSides("twoSampleZTest", sides);
  requireProbability("twoSampleZTest", "significanceLevel", significanceLevel);
  requireEstimableArm("twoSampleZTest", "treatment", treatment, metric);
  requireEstimableArm("twoSampleZTest", "holdout", holdout, metric);
  const test = twoSampleZTestUnchecked(createZTestScratch(), treatment, holdout, metric, sides, normalQuantile(1 - significanceLevel / sides));
  return {
    absolute: test.absolute,
    relative: test.ratioDefined ? Math.expm1(test.logRatio) : null,
    pooled: { z: test.zPooled, p: test.pPooled },
    unpooled: { z: test.zUnpooled, p: zTestPValue(test.zUnpooled, sides) },
    ci: { absolute: [test.lower, test.upper], relative: test.ratioDefined ? [test.relativeLower, test.relativeUpper] : null },
  };
}
