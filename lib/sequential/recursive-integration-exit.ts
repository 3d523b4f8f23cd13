import { normalCdf, normalDensity, normalSurvival } from "./normal-distribution";
import type { ContinuationDensity } from "./recursive-integration";

/** The probability of first leaving through one bound at a look, and the sub-density at that bound. */
export interface ExitProbability {
  /** P(continued at every earlier look and z_k beyond the bound) */
  readonly probability: number;
  /** the continuation sub-density of z_k at the bound (|d probability / d bound|) */
  readonly densityAtBound: number;
}

/**
 * First-exit probability of a group-sequential test at look k through one bound, under no effect:
 * P(Z_1, …, Z_{k−1} stayed in their continuation regions and Z_k ≥ bound) for side "upper", or
 * Z_k ≤ bound for side "lower"; with the sub-density of Z_k at the bound, which is the
 * derivative a boundary search (Newton's method) needs.
 *
 * Integrates the previous look's continuation sub-density against the normal tail of the
 * Brownian-motion increment: Σ_i w_i h(u_i) · Φ̄((b√t_k − u_i√t_{k−1})/√Δ) by Simpson's rule; at the
 * first look it is the normal tail itself.
 *
 * Reference: Jennison & Turnbull (2000), *Group Sequential Methods with Applications to Clinical
 * Trials*, §19.2; Armitage, McPherson & Rowe (1969), *JRSS A* 132. Assumes the canonical joint
 * distribution (independent normal score increments, known variance).
 * Complexity: O(m) time for m nodes at look k − 1, O(1) memory.
 *
 * @param previous - the continuation sub-density at look k − 1, or undefined when k is the first look
 * @param fraction - information fraction of look k, finite and > 0, above previous.fraction
 * @param bound - the boundary on the z scale of look k (±Infinity allowed, giving 0 or the continuation mass)
 * @param side - "upper" for Z_k ≥ bound, "lower" for Z_k ≤ bound
 * @returns the exit probability in [0, 1] and the sub-density at the bound
 * @throws RangeError when bound is NaN, fraction is not finite and > 0, or not above previous.fraction
 * @example exitProbability(undefined, 1, 1.959963984540054, "upper").probability // ≈ 0.025
 */
export function exitProbability(
  previous: ContinuationDensity | undefined,
  fraction: number,
  bound: number,
  side: "upper" | "lower",
): ExitProbability {
  if (Number.isNaN(bound)) throw new RangeError("exitProbability requires a bound, got NaN");
  if (!(Number.isFinite(fraction) && fraction > 0)) {
    throw new RangeError(`exitProbability requires a finite fraction > 0, got ${fraction}`);
  }
  if (previous !== undefined && !(fraction > previous.fraction)) {
    throw new RangeError(
      `exitProbability requires a fraction above the previous look's ${previous.fraction}, got ${fraction}`,
    );
  }
  const tail = side === "upper" ? normalSurvival : normalCdf;
  if (previous === undefined) {
    return { probability: tail(bound), densityAtBound: Number.isFinite(bound) ? normalDensity(bound) : 0 };
  }
  const increment = fraction - previous.fraction;
  const rootIncrement = Math.sqrt(increment);
  const rootPrevious = Math.sqrt(previous.fraction);
  const boundScore = bound * Math.sqrt(fraction);
  const { points, weightedDensity } = previous;
  let probability = 0;
  let density = 0;
  const sign = side === "upper" ? 1 : -1;
  for (let i = 0; i < points.length; i += 1) {
    const standardized = (boundScore - points[i] * rootPrevious) / rootIncrement;
    // Beyond 9 standard deviations the tail is 0 or 1 and the density 0 to double precision (φ(9) ≈ 1e-18).
    const away = sign * standardized;
    if (away > 9 || Number.isNaN(away)) continue;
    if (away < -9) {
      probability += weightedDensity[i];
      continue;
    }
    probability += weightedDensity[i] * tail(standardized);
    density += weightedDensity[i] * normalDensity(standardized);
  }
  return {
    probability: Math.min(1, Math.max(0, probability)),
    densityAtBound: (density * Math.sqrt(fraction)) / rootIncrement,
  };
}

/**
 * First-exit probability of a group-sequential test at look k through one bound, under no effect,
 * without the sub-density at the bound: the `probability` of {@link exitProbability} at half its
 * cost (one normal tail per node within reach, no density), for recursions that never search for
 * a bound (cumulative crossing probabilities, the cost of peeking).
 *
 * Σ_i w_i h(u_i) · Φ̄((b√t_k − u_i√t_{k−1})/√Δ) by Simpson's rule on the previous look's grid; nodes
 * more than 9 standard deviations of the increment past the bound add their whole mass, nodes more
 * than 9 short of it nothing (Φ̄(9) ≈ 1.1e-19).
 *
 * Reference: Jennison & Turnbull (2000), *Group Sequential Methods with Applications to Clinical
 * Trials*, §19.2; Armitage, McPherson & Rowe (1969), *JRSS A* 132. Assumes the canonical joint
 * distribution (independent normal score increments, known variance).
 * Complexity: O(m) time for m nodes at look k − 1, O(1) memory.
 *
 * @param previous - the continuation sub-density at look k − 1, or undefined when k is the first look
 * @param fraction - information fraction of look k, finite and > 0, above previous.fraction
 * @param bound - the boundary on the z scale of look k (±Infinity allowed, giving 0 or the continuation mass)
 * @param side - "upper" for Z_k ≥ bound, "lower" for Z_k ≤ bound
 * @returns the exit probability in [0, 1], equal to exitProbability(…).probability
 * @throws RangeError as {@link exitProbability}
 * @example exitMass(undefined, 1, 1.959963984540054, "upper") // ≈ 0.025
 */
export function exitMass(
  previous: ContinuationDensity | undefined,
  fraction: number,
  bound: number,
  side: "upper" | "lower",
): number {
  if (Number.isNaN(bound)) throw new RangeError("exitMass requires a bound, got NaN");
  if (!(Number.isFinite(fraction) && fraction > 0)) {
    throw new RangeError(`exitMass requires a finite fraction > 0, got ${fraction}`);
  }
  if (previous !== undefined && !(fraction > previous.fraction)) {
    throw new RangeError(`exitMass requires a fraction above the previous look's ${previous.fraction}, got ${fraction}`);
  }
  if (previous === undefined) return side === "upper" ? normalSurvival(bound) : normalCdf(bound);
  if (bound === (side === "upper" ? Infinity : -Infinity)) return 0;
  const { points, weightedDensity } = previous;
  // On the side's own scale (z → −z for "lower") the exit is always through an upper bound.
  const sign = side === "upper" ? 1 : -1;
  const inverseRoot = 1 / Math.sqrt(fraction - previous.fraction);
  const boundScore = sign * bound * Math.sqrt(fraction) * inverseRoot;
  const step = Math.sqrt(previous.fraction) * inverseRoot * sign;
  let probability = 0;
  for (let i = 0; i < points.length; i += 1) {
    const standardized = boundScore - points[i] * step;
    if (standardized > 9 || Number.isNaN(standardized)) continue;
    probability += standardized < -9 ? weightedDensity[i] : weightedDensity[i] * normalSurvival(standardized);
  }
  return Math.min(1, Math.max(0, probability));
}
