import type { Sides } from "./types";
import { normalQuantile } from "./normal-distribution";
import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";
import { requireSides } from "./require-sides";

/** Planned units per arm (rounded up) and their exact, unrounded values. */
export interface SampleSize {
  readonly treatment: number;
  readonly holdout: number;
  readonly total: number;
  readonly exact: { readonly treatment: number; readonly holdout: number };
}

/**
 * Sample size for comparing two proportions, with unequal allocation allowed (a 10 % holdout is
 * common).
 *
 * Normal approximation with the pooled variance under H0 and the unpooled variance under H1, far
 * tail ignored — R's `power.prop.test(strict = FALSE)` formula for equal arms, generalised to shares
 * `w_T`, `w_C` as statsmodels' `samplesize_proportions_2indep_onetail`:
 * `N = (z_{1−α/s}·sqrt(p̄q̄(1/w_T + 1/w_C)) + z_{power}·sqrt(p_T q_T/w_T + p_C q_C/w_C))² / (p_T − p_C)²`,
 * `p̄ = w_T p_T + w_C p_C`, `p_T = baseline·(1 + lift)`, arms `w·N` each rounded up.
 * Reference: Fleiss, Levin & Paik (2003), *Statistical Methods for Rates and Proportions*.
 * Assumes independent units and a fixed-horizon test. Complexity: O(1).
 *
 * @param options.baselineRate - holdout conversion rate, in (0, 1)
 * @param options.minimumLift - relative lift to detect (0.10 = +10 %), non-zero, with baseline·(1 + lift) in (0, 1)
 * @param options.significanceLevel - α in (0, 1), default 0.05
 * @param options.power - 1 − β in (0, 1), default 0.8
 * @param options.sides - 1 or 2, default 2
 * @param options.holdoutShare - share of units in the holdout, in (0, 1), default 0.5
 * @returns units per arm (rounded up), their total, and the unrounded values
 * @throws RangeError for each argument outside its range
 * @example sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: 0.1 }).treatment // 14751 (R power.prop.test: n = 14750.79)
 */
export function sampleSizeTwoProportions(options: {
  baselineRate: number;
  minimumLift: number;
  significanceLevel?: number;
  power?: number;
  sides?: Sides;
  holdoutShare?: number;
}): SampleSize {
  const name = "sampleSizeTwoProportions";
  const { baselineRate, minimumLift } = options;
  const significanceLevel = options.significanceLevel ?? 0.05;
  const power = options.power ?? 0.8;
  const sides = options.sides ?? 2;
  const holdoutShare = options.holdoutShare ?? 0.5;
  requireProbability(name, "baselineRate", baselineRate);
  requireFinite(name, "minimumLift", minimumLift);
  requireProbability(name, "significanceLevel", significanceLevel);
  requireProbability(name, "power", power);
  requireSides(name, sides);
  requireProbability(name, "holdoutShare", holdoutShare);
  const treatmentRate = baselineRate * (1 + minimumLift);
  if (minimumLift === 0 || !(treatmentRate > 0 && treatmentRate < 1)) {
    throw new RangeError(`${name} requires a non-zero minimumLift with baselineRate·(1 + minimumLift) in (0, 1), got ${treatmentRate}`);
  }
  const treatmentShare = 1 - holdoutShare;
  const pooledRate = treatmentShare * treatmentRate + holdoutShare * baselineRate;
  const nullSd = Math.sqrt(pooledRate * (1 - pooledRate) * (1 / treatmentShare + 1 / holdoutShare));
  const alternativeSd = Math.sqrt((treatmentRate * (1 - treatmentRate)) / treatmentShare + (baselineRate * (1 - baselineRate)) / holdoutShare);
  const numerator = normalQuantile(1 - significanceLevel / sides) * nullSd + normalQuantile(power) * alternativeSd;
  const total = (numerator * numerator) / ((treatmentRate - baselineRate) * (treatmentRate - baselineRate));
  return roundArms(total * treatmentShare, total * holdoutShare);
}

function roundArms(treatment: number, holdout: number): SampleSize {
  const roundedTreatment = Math.ceil(treatment);
  const roundedHoldout = Math.ceil(holdout);
  return { treatment: roundedTreatment, holdout: roundedHoldout, total: roundedTreatment + roundedHoldout, exact: { treatment, holdout } };
}
