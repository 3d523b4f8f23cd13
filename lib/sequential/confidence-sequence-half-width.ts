import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";

/**
 * Half-width of the normal-mixture confidence sequence for an effect estimated by `Δ ~ N(θ, V)`:
 * `sqrt( V(V + τ²)/τ² · (log((V + τ²)/V) + 2 log(1/α)) )`. The set `Δ ± halfWidth` is exactly
 * the set of θ the mSPRT at level α does not reject, so it covers θ at all times at once.
 *
 * Reference: Johari, Koomen, Pekelis & Walsh (2022), *Operations Research* 70(3);
 * Howard, Ramdas, McAuliffe & Sekhon (2021), *Annals of Statistics* 49(2) (normal mixture).
 * Asymptotic when V is estimated (Waudby-Smith et al. 2024). Complexity: O(1).
 *
 * @param variance - V > 0
 * @param tau - τ > 0, the mixing standard deviation
 * @param significanceLevel - α in (0, 1)
 * @returns the half-width > 0
 * @throws RangeError when variance or tau ≤ 0, or α outside (0, 1)
 * @example confidenceSequenceHalfWidth(1, 1, 0.05) // ≈ 3.6564
 */
export function confidenceSequenceHalfWidth(variance: number, tau: number, significanceLevel: number): number {
  requireFinite("confidenceSequenceHalfWidth", "variance", variance);
  requireFinite("confidenceSequenceHalfWidth", "tau", tau);
  if (variance <= 0) throw new RangeError(`confidenceSequenceHalfWidth requires variance > 0, got ${variance}`);
  if (tau <= 0) throw new RangeError(`confidenceSequenceHalfWidth requires tau > 0, got ${tau}`);
  requireProbability("confidenceSequenceHalfWidth", "significanceLevel", significanceLevel);
  const tauSquared = tau * tau;
  return Math.sqrt(((variance * (variance + tauSquared)) / tauSquared) * (Math.log1p(tauSquared / variance) + 2 * Math.log(1 / significanceLevel)));
}
