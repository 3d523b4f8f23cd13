import { requireFinite } from "./require-finite";

/**
 * Binomial probability mass `P(X = k)` for `X ~ Binomial(n, p)`, accurate to about 1e-14 relative
 * even for large `n` and far tails (where summing `log Γ` loses digits).
 *
 * Reference: Loader (2000), "Fast and Accurate Computation of Binomial Probabilities" (the
 * saddle-point form with `stirlerr` and `bd0` that R's `dbinom` uses). Complexity: O(1).
 *
 * @param successes - k, an integer (outside [0, n] gives 0)
 * @param trials - n, a non-negative integer
 * @param probability - p in [0, 1]
 * @returns P(X = k) in [0, 1]
 * @throws RangeError when n is not a non-negative integer, k not an integer, or p outside [0, 1]
 * @example binomialProbability(3, 10, 0.5) // 0.1171875
 */
export function binomialProbability(successes: number, trials: number, probability: number): number {
  requireFinite("binomialProbability", "successes", successes);
  requireFinite("binomialProbability", "trials", trials);
  if (!Number.isInteger(trials) || trials < 0) throw new RangeError(`binomialProbability requires trials to be a non-negative integer, got ${trials}`);
  if (!Number.isInteger(successes)) throw new RangeError(`binomialProbability requires successes to be an integer, got ${successes}`);
  if (!(probability >= 0 && probability <= 1)) throw new RangeError(`binomialProbability requires probability in [0, 1], got ${probability}`);
  return binomialRaw(successes, trials, probability, 1 - probability);
}

/**
 * Binomial mass without argument checks, with `q = 1 − p` passed separately to keep its precision
 * (Loader's `dbinom_raw`); the kernel of {@link binomialProbability} and the hypergeometric mass.
 *
 * Reference: Loader (2000), "Fast and Accurate Computation of Binomial Probabilities". Complexity: O(1).
 *
 * @param x - an integer (outside [0, n] gives 0)
 * @param n - a non-negative integer
 * @param p - in [0, 1]
 * @param q - 1 − p, in [0, 1]
 * @returns P(X = x) in [0, 1]
 * @example binomialRaw(3, 10, 0.5, 0.5) // 0.1171875
 */
export function binomialRaw(x: number, n: number, p: number, q: number): number {
  if (x < 0 || x > n) return 0;
  if (p === 0) return x === 0 ? 1 : 0;
  if (q === 0) return x === n ? 1 : 0;
  if (x === 0) {
    if (n === 0) return 1;
    return Math.exp(p < 0.1 ? -deviance(n, n * q) - n * p : n * Math.log(q));
  }
  if (x === n) return Math.exp(q < 0.1 ? -deviance(n, n * p) - n * q : n * Math.log(p));
  const logCore = stirlingError(n) - stirlingError(x) - stirlingError(n - x) - deviance(x, n * p) - deviance(n - x, n * q);
  const logFactor = Math.log(2 * Math.PI) + Math.log(x) + Math.log1p(-x / n);
  return Math.exp(logCore - 0.5 * logFactor);
}

/** log(n!) − log(√(2πn) (n/e)^n) for an integer n ≥ 1 (Loader 2000). */
function stirlingError(n: number): number {
  if (n <= 15) {
    let logFactorial = 0;
    for (let i = 2; i <= n; i++) logFactorial += Math.log(i);
    return logFactorial - (n + 0.5) * Math.log(n) + n - 0.5 * Math.log(2 * Math.PI);
  }
  const s0 = 1 / 12, s1 = 1 / 360, s2 = 1 / 1260, s3 = 1 / 1680, s4 = 1 / 1188;
  const nn = n * n;
  if (n > 500) return (s0 - s1 / nn) / n;
  if (n > 80) return (s0 - (s1 - s2 / nn) / nn) / n;
  if (n > 35) return (s0 - (s1 - (s2 - s3 / nn) / nn) / nn) / n;
  return (s0 - (s1 - (s2 - (s3 - s4 / nn) / nn) / nn) / nn) / n;
}

/** Deviance term x·log(x/m) + m − x, computed without cancellation near x = m (Loader 2000). */
function deviance(x: number, mean: number): number {
  if (Math.abs(x - mean) < 0.1 * (x + mean)) {
    let v = (x - mean) / (x + mean);
    let sum = (x - mean) * v;
    let term = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      term *= v;
      const next = sum + term / (2 * j + 1);
      if (next === sum) return next;
      sum = next;
    }
    return sum;
  }
  return x * Math.log(x / mean) + mean - x;
}
