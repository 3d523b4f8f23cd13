import { hwangShihDeCaniSpending, obrienFlemingSpending, pocockSpending } from "./alpha-spending";
import { normalQuantile } from "./normal-distribution";
import { continuationDensity, type ContinuationDensity } from "./recursive-integration";
import { DEFAULT_RESOLUTION } from "./recursive-integration-crossing";
import { exitProbability } from "./recursive-integration-exit";
import { lookResolution } from "./recursive-integration-resolution";

/** The design of a group-sequential test with alpha spending. */
export interface SpendingBoundariesOptions {
  /** information fraction of each look, strictly increasing in (0, 1], the last exactly 1 */
  informationFractions: readonly number[];
  /** overall type I error α in (0, 1); both sides together when two-sided */
  significanceLevel: number;
  /** 2 (default): symmetric boundaries ±z_k; 1: an upper boundary z_k only */
  sides?: 1 | 2;
  /** "obf": Lan–DeMets O'Brien–Fleming type; "pocock": Lan–DeMets Pocock type; "hsd": Hwang–Shih–DeCani(γ) */
  spending: "obf" | "pocock" | "hsd";
  /** the Hwang–Shih–DeCani shape γ, finite and non-zero; required for "hsd", ignored otherwise */
  gamma?: number;
}

/** Boundaries of a spending design: reject at look k when Z_k ≥ z[k] (or |Z_k| ≥ z[k] two-sided). */
export interface SpendingBoundaries {
  /** critical value on the z scale at each look; +Infinity where nothing is left to spend */
  z: number[];
  /** cumulative α spent by each look, α(t_k); the last equals significanceLevel */
  cumulativeAlpha: number[];
}

/** A spend below this cannot be represented by a finite z bound (Φ̄ underflows past z ≈ 37). */
const SMALLEST_SPEND = 1e-300;

/**
 * Group-sequential boundaries from an alpha-spending function (Lan & DeMets): at each look k the
 * critical value z_k is chosen so that, under no effect, the probability of first crossing at
 * look k equals α(t_k) − α(t_{k−1}) — split equally between the two sides of a symmetric
 * two-sided design. Works for any information fractions, equal or not, so looks need not be
 * planned in advance. Use it when a team reads results only at set looks.
 *
 * Each z_k solves the first-exit equation by Newton's method in log space (bracketed), with the
 * exit probability and its derivative from the recursive numerical integration; the boundaries
 * from grids r and 2r are combined by Richardson extrapolation.
 *
 * Reference: Lan & DeMets (1983), "Discrete sequential boundaries for clinical trials",
 * *Biometrika* 70(3), 659–663, https://doi.org/10.1093/biomet/70.3.659; Hwang, Shih & DeCani
 * (1990), *Statistics in Medicine* 9(12), 1439–1445; Jennison & Turnbull (2000), *Group
 * Sequential Methods with Applications to Clinical Trials*, ch. 7 and §19.2. Agrees with R's
 * rpact `getDesignGroupSequential(typeOfDesign = "asOF" / "asP" / "asHSD")`. Assumes the
 * canonical joint distribution corr(Z_i, Z_j) = √(t_i/t_j).
 * Complexity: O(K·m·w) for the densities plus O(K·m·n) for n ≈ 3–8 Newton steps; 20 looks take
 * a few milliseconds.
 *
 * @param options - the design; see {@link SpendingBoundariesOptions}
 * @returns the critical values z and the cumulative α spent at each look
 * @throws RangeError when the fractions are empty, not strictly increasing in (0, 1] or do not end
 *   at 1; when significanceLevel is outside (0, 1); when sides is not 1 or 2; when spending is
 *   not "obf", "pocock" or "hsd"; when spending is "hsd" without a finite non-zero gamma
 * @example
 * spendingBoundaries({ informationFractions: [0.25, 0.5, 0.75, 1], significanceLevel: 0.05, spending: "obf" }).z
 * // ≈ [4.3326, 2.9631, 2.3590, 2.0141]
 */
export function spendingBoundaries(options: SpendingBoundariesOptions): SpendingBoundaries {
  const { informationFractions, significanceLevel, sides = 2, spending, gamma } = options;
  if (!Array.isArray(informationFractions) || informationFractions.length === 0) {
    throw new RangeError("spendingBoundaries requires at least one information fraction");
  }
  let before = 0;
  for (const fraction of informationFractions) {
    if (!(typeof fraction === "number" && Number.isFinite(fraction) && fraction > before && fraction <= 1)) {
      throw new RangeError(
        `spendingBoundaries requires strictly increasing information fractions in (0, 1], got ${fraction}`,
      );
    }
    before = fraction;
  }
  if (before !== 1) {
    throw new RangeError(`spendingBoundaries requires the last information fraction to be 1, got ${before}`);
  }
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`spendingBoundaries requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`spendingBoundaries requires sides 1 or 2, got ${String(sides)}`);
  }
  if (spending === "hsd" && !(typeof gamma === "number" && Number.isFinite(gamma) && gamma !== 0)) {
    throw new RangeError(`spendingBoundaries requires a finite non-zero gamma for "hsd" spending, got ${gamma}`);
  }
  const spend = (fraction: number): number => {
    if (spending === "obf") return obrienFlemingSpending(fraction, significanceLevel, sides);
    if (spending === "pocock") return pocockSpending(fraction, significanceLevel);
    if (spending === "hsd") return hwangShihDeCaniSpending(fraction, significanceLevel, gamma as number);
    throw new RangeError(`spendingBoundaries requires spending "obf", "pocock" or "hsd", got ${String(spending)}`);
  };
  const cumulativeAlpha = informationFractions.map(spend);
  const perSide = cumulativeAlpha.map((value, k) => (value - (k === 0 ? 0 : cumulativeAlpha[k - 1])) / sides);
  const coarse = boundaryPass(informationFractions, perSide, sides, DEFAULT_RESOLUTION);
  const fine = boundaryPass(informationFractions, perSide, sides, 2 * DEFAULT_RESOLUTION);
  const z = fine.map((value, k) => (Number.isFinite(value) && Number.isFinite(coarse[k]) ? (16 * value - coarse[k]) / 15 : value));
  return { z, cumulativeAlpha };
}

/** One pass of the boundary search on grid parameter r. */
function boundaryPass(
  fractions: readonly number[],
  perSide: readonly number[],
  sides: 1 | 2,
  resolution: number,
): number[] {
  const bounds: number[] = [];
  let previous: ContinuationDensity | undefined;
  for (let k = 0; k < fractions.length; k += 1) {
    const bound = perSide[k] > SMALLEST_SPEND ? solveBound(previous, fractions[k], perSide[k], sides) : Infinity;
    bounds.push(bound);
    if (k + 1 < fractions.length) {
      const grid = lookResolution(resolution, fractions, k);
      previous = continuationDensity(previous, fractions[k], sides === 2 ? -bound : -Infinity, bound, grid);
    }
  }
  return bounds;
}

/** The bound b with P(continued so far and Z_k ≥ b) = target: Newton on log-probability, bracketed. */
function solveBound(previous: ContinuationDensity | undefined, fraction: number, target: number, sides: 1 | 2): number {
  let high = -normalQuantile(target);
  if (previous === undefined) return high;
  let low = sides === 2 ? 0 : -40;
  const logTarget = Math.log(target);
  let bound = high;
  for (let iteration = 0; iteration < 100; iteration += 1) {
    const { probability, densityAtBound } = exitProbability(previous, fraction, bound, "upper");
    if (probability > target) low = bound;
    else high = bound;
    let next = Number.NaN;
    if (probability > 0 && densityAtBound > 0) {
      next = bound + ((Math.log(probability) - logTarget) * probability) / densityAtBound;
    }
    if (!(next > low && next < high)) next = 0.5 * (low + high);
    if (Math.abs(next - bound) < 1e-12 * Math.max(1, Math.abs(bound))) return next;
    bound = next;
  }
  return bound;
}
