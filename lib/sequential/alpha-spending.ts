import { normalQuantile, normalSurvival } from "./normal-distribution";

function validate(name: string, informationFraction: number, significanceLevel: number): void {
  if (!(informationFraction >= 0 && informationFraction <= 1)) {
    throw new RangeError(`${name} requires an information fraction in [0, 1], got ${informationFraction}`);
  }
  if (!(significanceLevel > 0 && significanceLevel < 1)) {
    throw new RangeError(`${name} requires a significanceLevel in (0, 1), got ${significanceLevel}`);
  }
}

/**
 * Lan–DeMets O'Brien–Fleming-type alpha-spending function: the cumulative type I error a
 * group-sequential test may have spent by information fraction t. It spends almost nothing
 * early and nearly all of α near the end, like O'Brien & Fleming's constant-score boundary.
 *
 * One-sided: α(t) = 2 − 2Φ(z₁₋α/₂ / √t). Two-sided (symmetric), each side spends the one-sided
 * function at α/2, so the total is α(t) = 4 − 4Φ(z₁₋α/₄ / √t) (the convention of R's rpact
 * `typeOfDesign = "asOF"`; Lan & DeMets' paper writes 2 − 2Φ(z_α/₂ / √t) for the total, which
 * is slightly different before t = 1).
 *
 * Reference: Lan & DeMets (1983), "Discrete sequential boundaries for clinical trials",
 * *Biometrika* 70(3), 659–663, https://doi.org/10.1093/biomet/70.3.659.
 * Complexity: O(1).
 *
 * @param informationFraction - t in [0, 1]
 * @param significanceLevel - the overall α in (0, 1) (both sides together when two-sided)
 * @param sides - 1 or 2 (default 2)
 * @returns α(t) in [0, α], 0 at t = 0 and exactly α at t = 1
 * @throws RangeError when t is outside [0, 1], α outside (0, 1), or sides not 1 or 2
 * @example obrienFlemingSpending(0.5, 0.05, 2) // ≈ 0.003051
 */
export function obrienFlemingSpending(informationFraction: number, significanceLevel: number, sides: 1 | 2 = 2): number {
  validate("obrienFlemingSpending", informationFraction, significanceLevel);
  if (sides !== 1 && sides !== 2) {
    throw new RangeError(`obrienFlemingSpending requires sides 1 or 2, got ${String(sides)}`);
  }
  if (informationFraction === 0) return 0;
  if (informationFraction === 1) return significanceLevel;
  const perSide = significanceLevel / sides;
  const critical = -normalQuantile(perSide / 2);
  return Math.min(significanceLevel, 2 * sides * normalSurvival(critical / Math.sqrt(informationFraction)));
}

/**
 * Lan–DeMets Pocock-type alpha-spending function α(t) = α·log(1 + (e − 1)·t), which spends
 * α roughly evenly over the looks, like Pocock's constant boundary. Two-sided designs give α(t)/2
 * to each side.
 *
 * Reference: Lan & DeMets (1983), *Biometrika* 70(3), 659–663,
 * https://doi.org/10.1093/biomet/70.3.659 (the form given there, as in rpact `typeOfDesign = "asP"`).
 * Complexity: O(1).
 *
 * @param informationFraction - t in [0, 1]
 * @param significanceLevel - the overall α in (0, 1)
 * @returns α(t) in [0, α], exactly α at t = 1
 * @throws RangeError when t is outside [0, 1] or α outside (0, 1)
 * @example pocockSpending(0.5, 0.05) // ≈ 0.031006
 */
export function pocockSpending(informationFraction: number, significanceLevel: number): number {
  validate("pocockSpending", informationFraction, significanceLevel);
  if (informationFraction === 1) return significanceLevel;
  return Math.min(significanceLevel, significanceLevel * Math.log1p((Math.E - 1) * informationFraction));
}

/**
 * Hwang–Shih–DeCani alpha-spending family α(t) = α·(1 − e^(−γt)) / (1 − e^(−γ)), γ ≠ 0: γ = 1
 * resembles Pocock-type spending, γ = −4 O'Brien–Fleming-type; γ → 0 tends to α·t (not allowed
 * here: pass a non-zero γ). Two-sided designs give α(t)/2 to each side.
 *
 * Reference: Hwang, Shih & DeCani (1990), "Group sequential designs using a family of type I
 * error probability spending functions", *Statistics in Medicine* 9(12), 1439–1445,
 * https://doi.org/10.1002/sim.4780091207 (as rpact `typeOfDesign = "asHSD"`, `gammaA = γ`).
 * Complexity: O(1).
 *
 * @param informationFraction - t in [0, 1]
 * @param significanceLevel - the overall α in (0, 1)
 * @param gamma - the shape γ, finite and non-zero (negative spends later, positive earlier)
 * @returns α(t) in [0, α], exactly α at t = 1
 * @throws RangeError when t is outside [0, 1], α outside (0, 1), or γ not finite or zero
 * @example hwangShihDeCaniSpending(0.5, 0.05, -4) // ≈ 0.005960
 */
export function hwangShihDeCaniSpending(informationFraction: number, significanceLevel: number, gamma: number): number {
  validate("hwangShihDeCaniSpending", informationFraction, significanceLevel);
  if (!(Number.isFinite(gamma) && gamma !== 0)) {
    throw new RangeError(`hwangShihDeCaniSpending requires a finite non-zero gamma, got ${gamma}`);
  }
  if (informationFraction === 1) return significanceLevel;
  if (gamma > 0) {
    return Math.min(significanceLevel, (significanceLevel * Math.expm1(-gamma * informationFraction)) / Math.expm1(-gamma));
  }
  // γ < 0: divide through by e^(−γ) so a steep γ cannot overflow.
  const steepness = -gamma;
  const ratio = Math.expm1(-steepness * informationFraction) / Math.expm1(-steepness);
  return Math.min(significanceLevel, significanceLevel * Math.exp(steepness * (informationFraction - 1)) * ratio);
}
