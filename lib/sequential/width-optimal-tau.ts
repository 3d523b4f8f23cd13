import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";

/**
 * Mixing standard deviation τ of the normal-mixture mSPRT chosen so that its confidence sequence is
 * (nearly) tightest when the variance of the lift estimate equals `horizonVariance` — at the planned
 * horizon: `τ² = V*·(2 log(1/α) + log(1 + 2 log(1/α)))`.
 *
 * Reference: Howard, Ramdas, McAuliffe & Sekhon (2021), *Annals of Statistics* 49(2)
 * (tuning the normal mixture to a target sample size); DESIGN.md §3. Fix τ before the data
 * arrive. Complexity: O(1).
 *
 * @param horizonVariance - V*, the variance of the lift estimate expected at the planned horizon, > 0
 * @param significanceLevel - α of the sequence, in (0, 1)
 * @returns τ > 0 (same units as the lift)
 * @throws RangeError when horizonVariance ≤ 0 or α outside (0, 1)
 * @example widthOptimalTau(1e-4, 0.05) // ≈ 0.02817
 */
export function widthOptimalTau(horizonVariance: number, significanceLevel: number): number {
  requireFinite("widthOptimalTau", "horizonVariance", horizonVariance);
  if (horizonVariance <= 0) throw new RangeError(`widthOptimalTau requires horizonVariance > 0, got ${horizonVariance}`);
  requireProbability("widthOptimalTau", "significanceLevel", significanceLevel);
  const twiceLog = 2 * Math.log(1 / significanceLevel);
  return Math.sqrt(horizonVariance * (twiceLog + Math.log(1 + twiceLog)));
}
