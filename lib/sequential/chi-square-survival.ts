import jStat from "jstat";
import { normalSurvival } from "./normal-distribution";
import { requireFinite } from "./require-finite";

/**
 * Upper tail of the chi-square distribution, `P(X ≥ statistic)` for `X ~ χ²(degreesOfFreedom)`,
 * i.e. the regularized upper incomplete gamma `Q(k/2, x/2)`, accurate for tiny p-values.
 *
 * One degree of freedom: `2·(1 − Φ(√x))`; two: `exp(−x/2)` (exact identities). Otherwise the series for `x < a + 1`, Lentz continued fraction otherwise (Press, Teukolsky, Vetterling &
 * Flannery, *Numerical Recipes*, 3rd ed., §6.2); `log Γ` of the half-integer `a` summed exactly.
 * Complexity: O(√x) iterations at most, O(1) in practice.
 *
 * @param statistic - x ≥ 0
 * @param degreesOfFreedom - a positive integer
 * @returns p in [0, 1]
 * @throws RangeError when x < 0 or not finite, or degreesOfFreedom is not a positive integer
 * @example chiSquareSurvival(3.841458820694124, 1) // ≈ 0.05
 */
export function chiSquareSurvival(statistic: number, degreesOfFreedom: number): number {
  requireFinite("chiSquareSurvival", "statistic", statistic);
  if (statistic < 0) throw new RangeError(`chiSquareSurvival requires statistic ≥ 0, got ${statistic}`);
  if (!Number.isInteger(degreesOfFreedom) || degreesOfFreedom < 1) {
    throw new RangeError(`chiSquareSurvival requires degreesOfFreedom to be a positive integer, got ${degreesOfFreedom}`);
  }
  if (degreesOfFreedom === 1) return Math.min(1, 2 * normalSurvival(Math.sqrt(statistic)));
  if (degreesOfFreedom === 2) return Math.exp(-statistic / 2);
  const a = degreesOfFreedom / 2;
  const x = statistic / 2;
  if (x === 0) return 1;
  const logPrefix = -x + a * Math.log(x) - logGammaHalfInteger(a);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 10000; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-17) break;
    }
    return Math.min(1, Math.max(0, 1 - sum * Math.exp(logPrefix)));
  }
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.min(1, Math.max(0, Math.exp(logPrefix) * h));
}

/** log Γ(a) for a = k/2 summed exactly (k ≤ 2000), else jStat's Lanczos value. */
function logGammaHalfInteger(a: number): number {
  if (a > 1000) return jStat.gammaln(a);
  let value = Number.isInteger(a) ? 0 : 0.5 * Math.log(Math.PI);
  for (let z = Number.isInteger(a) ? 1 : 0.5; z < a; z += 1) value += Math.log(z);
  return value;
}
