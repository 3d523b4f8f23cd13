import { requireFinite } from "./require-finite";
import { requireProbability } from "./require-probability";

/** Per-look results of {@link alwaysValidSequenceArrays}. */
export interface SequenceArrays {
  /** Always-valid p-value after each look, non-increasing. */
  readonly p: Float64Array;
  /** Running-intersected confidence sequence after each look (−Infinity / +Infinity before the first look). */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
}

/**
 * The mSPRT over looks given as parallel arrays (no objects per look): always-valid p-value
 * `p_t = min(1, p_{t−1}, 1/Λ_t)` and the running intersection of `Δ_t ± h_t`. A look whose variance
 * is 0 has nothing to estimate yet and repeats the previous step. The closed forms are those of
 * {@link msprtLogLikelihoodRatio} and {@link confidenceSequenceHalfWidth}, sharing log(1 + τ²/V).
 *
 * Reference: Robbins (1970); Johari, Koomen, Pekelis & Walsh (2022), *Operations Research* 70(3).
 * Complexity: O(looks), three typed arrays allocated.
 *
 * @param estimates - Δ at each look (finite where the variance is > 0)
 * @param variances - V at each look, > 0, or 0 for "no look yet"
 * @param options.tau - τ > 0
 * @param options.significanceLevel - α in (0, 1)
 * @returns p, lower and upper per look
 * @throws RangeError when τ ≤ 0, α outside (0, 1), the arrays differ in length, or a look has a non-finite estimate or a negative or non-finite variance
 * @example alwaysValidSequenceArrays(Float64Array.of(0.5), Float64Array.of(0.01), { tau: 0.2, significanceLevel: 0.05 }).p[0] // ≈ 1.015e-4
 */
export function alwaysValidSequenceArrays(
  estimates: ArrayLike<number>,
  variances: ArrayLike<number>,
  options: { tau: number; significanceLevel: number },
): SequenceArrays {
  const name = "alwaysValidSequence";
  requireFinite(name, "tau", options.tau);
  if (options.tau <= 0) throw new RangeError(`${name} requires tau > 0, got ${options.tau}`);
  requireProbability(name, "significanceLevel", options.significanceLevel);
  if (estimates.length !== variances.length) throw new RangeError(`${name} requires as many estimates as variances`);
  const looks = estimates.length;
  const p = new Float64Array(looks);
  const lower = new Float64Array(looks);
  const upper = new Float64Array(looks);
  const tauSquared = options.tau * options.tau;
  const twiceLogInverseLevel = 2 * Math.log(1 / options.significanceLevel);
  let pValue = 1;
  let low = -Infinity;
  let high = Infinity;
  for (let i = 0; i < looks; i++) {
    const variance = variances[i];
    if (variance !== 0) {
      const estimate = estimates[i];
      if (!Number.isFinite(estimate) || !(variance > 0) || !Number.isFinite(variance)) {
        throw new RangeError(`${name} requires each look to have a finite estimate and a variance > 0, got ${estimate} and ${variance} at look ${i}`);
      }
      const logVarianceRatio = Math.log1p(tauSquared / variance);
      const total = variance + tauSquared;
      const logLikelihoodRatio = -0.5 * logVarianceRatio + (tauSquared * estimate * estimate) / (2 * variance * total);
      pValue = Math.min(pValue, Math.exp(-logLikelihoodRatio));
      const half = Math.sqrt(((variance * total) / tauSquared) * (logVarianceRatio + twiceLogInverseLevel));
      if (estimate - half > low) low = estimate - half;
      if (estimate + half < high) high = estimate + half;
    }
    p[i] = pValue;
    lower[i] = low;
    upper[i] = high;
  }
  return { p, lower, upper };
}
