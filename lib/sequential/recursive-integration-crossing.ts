import { continuationDensity, type ContinuationDensity } from "./recursive-integration";
import { exitMass } from "./recursive-integration-exit";
import { lookResolution } from "./recursive-integration-resolution";

/** Default grid parameter r; the result is Richardson-extrapolated from r and 2r. */
export const DEFAULT_RESOLUTION = 20;

/**
 * Cumulative boundary-crossing probabilities of a group-sequential test under no effect: after
 * each look k, P(the z statistic has left its continuation region at some look ≤ k), by the
 * recursive numerical integration of Armitage, McPherson & Rowe, with the upper and lower parts.
 *
 * Each pass runs the look-by-look update ({@link continuationDensity}, {@link exitProbability}) on
 * Jennison & Turnbull's grid; the grid is refined where consecutive looks are close
 * (kernel width under 0.1). Simpson's rule has error O(h⁴), so two passes, with r and 2r, are
 * combined by Richardson extrapolation (16·P₂ᵣ − Pᵣ)/15, which removes the leading error term.
 *
 * Reference: Armitage, McPherson & Rowe (1969), "Repeated significance tests on accumulating
 * data", *JRSS A* 132, 235–244; Jennison & Turnbull (2000), *Group Sequential Methods with
 * Applications to Clinical Trials*, ch. 19; Richardson extrapolation (e.g. Press et al.,
 * *Numerical Recipes*, 3rd ed., §4.3). Assumes the canonical joint distribution: Z_k√t_k is
 * Brownian motion in the information fraction t.
 * Complexity: O(Σ_k m_k·w) time with m_k ≈ 5.3·r grid nodes inside a region like ±2 and
 * w nodes within reach of the kernel; O(max m_k) memory. 100 looks take a few milliseconds.
 *
 * @param informationFractions - strictly increasing, finite, > 0 (any common scale)
 * @param upper - upper boundary on the z scale at each look (+Infinity for none), same length
 * @param lower - lower boundary at each look (−Infinity for none), below upper; "symmetric" for −upper
 * @param resolution - grid parameter r, an integer ≥ 2 (default 20)
 * @returns cumulative probabilities after each look: total, through the upper and through the lower boundary
 * @throws RangeError when the arrays are empty or differ in length, the fractions are not strictly
 *   increasing positive finite numbers, a bound is NaN, a lower bound is not below its upper bound,
 *   or resolution is not an integer ≥ 2
 * @example
 * crossingProbabilities([0.5, 1], [1.96, 1.96], "symmetric").total[1] // ≈ 0.0831
 */
export function crossingProbabilities(
  informationFractions: readonly number[],
  upper: readonly number[],
  lower: readonly number[] | "symmetric",
  resolution = DEFAULT_RESOLUTION,
): { total: number[]; upper: number[]; lower: number[] } {
  const looks = informationFractions.length;
  if (looks === 0) throw new RangeError("crossingProbabilities requires at least one look");
  if (upper.length !== looks || (lower !== "symmetric" && lower.length !== looks)) {
    throw new RangeError("crossingProbabilities requires one upper and one lower bound per look");
  }
  if (!Number.isInteger(resolution) || resolution < 2) {
    throw new RangeError(`crossingProbabilities requires an integer resolution ≥ 2, got ${resolution}`);
  }
  let before = 0;
  for (const fraction of informationFractions) {
    if (!(Number.isFinite(fraction) && fraction > before)) {
      throw new RangeError("crossingProbabilities requires strictly increasing finite fractions > 0");
    }
    before = fraction;
  }
  const lowerBounds = lower === "symmetric" ? upper.map((bound) => -bound) : lower;
  for (let k = 0; k < looks; k += 1) {
    if (Number.isNaN(upper[k]) || Number.isNaN(lowerBounds[k]) || !(lowerBounds[k] < upper[k])) {
      throw new RangeError(`crossingProbabilities requires lower < upper at look ${k + 1}`);
    }
  }
  const coarse = crossingPass(informationFractions, upper, lowerBounds, resolution);
  const fine = crossingPass(informationFractions, upper, lowerBounds, 2 * resolution);
  const extrapolate = (coarseValues: number[], fineValues: number[]): number[] => {
    let running = 0;
    return fineValues.map((value, k) => {
      running = Math.max(running, Math.min(1, (16 * value - coarseValues[k]) / 15));
      return running;
    });
  };
  return {
    total: extrapolate(coarse.total, fine.total),
    upper: extrapolate(coarse.upper, fine.upper),
    lower: extrapolate(coarse.lower, fine.lower),
  };
}

/** One pass of the recursion with grid parameter r; cumulative crossing probabilities. */
function crossingPass(
  fractions: readonly number[],
  upper: readonly number[],
  lower: readonly number[],
  resolution: number,
): { total: number[]; upper: number[]; lower: number[] } {
  const total: number[] = [];
  const upperCumulative: number[] = [];
  const lowerCumulative: number[] = [];
  let upperSum = 0;
  let lowerSum = 0;
  let previous: ContinuationDensity | undefined;
  // Two buffers taken in turn: look k reads one while writing the other.
  let buffers: [Float64Array, Float64Array] | undefined;
  for (let k = 0; k < fractions.length; k += 1) {
    const fraction = fractions[k];
    const symmetricLook = lower[k] === -upper[k] && (previous === undefined || previous.symmetric);
    const upperExit = exitMass(previous, fraction, upper[k], "upper");
    const lowerExit = symmetricLook ? upperExit : exitMass(previous, fraction, lower[k], "lower");
    upperSum += upperExit;
    lowerSum += lowerExit;
    upperCumulative.push(upperSum);
    lowerCumulative.push(lowerSum);
    total.push(upperSum + lowerSum);
    if (k + 1 < fractions.length) {
      const grid = lookResolution(resolution, fractions, k);
      // A grid with parameter r has at most 2·(6r + 1) + 1 nodes (base points, two ends, midpoints).
      const nodes = 12 * grid + 3;
      if (buffers === undefined || buffers[0].length < nodes) buffers = [new Float64Array(nodes), new Float64Array(nodes)];
      previous = continuationDensity(previous, fraction, lower[k], upper[k], grid, buffers[k & 1]);
    }
  }
  return { total, upper: upperCumulative, lower: lowerCumulative };
}
