import type { Sides } from "./types";
import type { SampleSize } from "./sample-size-two-proportions";
import { normalQuantile } from "./normal-distribution";
import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";
import { requireSides } from "./require-sides";

/**
 * Sample size for comparing two means (e.g. revenue per unit) with a known planned standard
 * deviation, unequal allocation allowed.
 *
 * `N = (z_{1−α/s} + z_{power})² σ² (1/w_T + 1/w_C) / δ²` with `δ = baselineMean·minimumLift`, arms
 * `w·N` rounded up (far tail ignored). Reference: Chow, Shao & Wang (2008), *Sample Size
 * Calculations in Clinical Research*; statsmodels `NormalIndPower().solve_power` is the same
 * test. Assumes independent units, a common σ, normal approximation. Complexity: O(1).
 *
 * @param options.baselineMean - holdout mean per unit, non-zero finite
 * @param options.minimumLift - relative lift to detect, non-zero finite
 * @param options.standardDeviation - planned σ per unit, > 0
 * @param options.significanceLevel - α in (0, 1), default 0.05
 * @param options.power - in (0, 1), default 0.8
 * @param options.sides - 1 or 2, default 2
 * @param options.holdoutShare - in (0, 1), default 0.5
 * @returns units per arm (rounded up), total and unrounded values
 * @throws RangeError for each argument outside its range
 * @example sampleSizeTwoMeans({ baselineMean: 10, minimumLift: 0.05, standardDeviation: 20 }).treatment // 25117
 */
export function sampleSizeTwoMeans(options: {
  baselineMean: number;
  minimumLift: number;
  standardDeviation: number;
  significanceLevel?: number;
  power?: number;
  sides?: Sides;
  holdoutShare?: number;
}): SampleSize {
  const name = "sampleSizeTwoMeans";
  const significanceLevel = options.significanceLevel ?? 0.05;
  const power = options.power ?? 0.8;
  const sides = options.sides ?? 2;
  const holdoutShare = options.holdoutShare ?? 0.5;
  requireFinite(name, "baselineMean", options.baselineMean);
  requireFinite(name, "minimumLift", options.minimumLift);
  requireFinite(name, "standardDeviation", options.standardDeviation);
  if (options.standardDeviation <= 0) throw new RangeError(`${name} requires standardDeviation > 0, got ${options.standardDeviation}`);
  const difference = options.baselineMean * options.minimumLift;
  if (difference === 0) throw new RangeError(`${name} requires a non-zero baselineMean·minimumLift`);
  requireProbability(name, "significanceLevel", significanceLevel);
  requireProbability(name, "power", power);
  requireSides(name, sides);
  requireProbability(name, "holdoutShare", holdoutShare);
  const treatmentShare = 1 - holdoutShare;
  const quantiles = normalQuantile(1 - significanceLevel / sides) + normalQuantile(power);
  const total = (quantiles * quantiles * options.standardDeviation ** 2 * (1 / treatmentShare + 1 / holdoutShare)) / (difference * difference);
  const treatment = Math.ceil(total * treatmentShare);
  const holdout = Math.ceil(total * holdoutShare);
  return { treatment, holdout, total: treatment + holdout, exact: { treatment: total * treatmentShare, holdout: total * holdoutShare } };
}
