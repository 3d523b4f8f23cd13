import type { Call, Interval } from "./types";

/**
 * The daily call for one treatment arm, a pure function of that day's always-valid results, in
 * precedence order `suspect` > `harm` > `lift` > `flat` > `horizon` > `collecting`:
 *
 * - `suspect`: a data-health check failed;
 * - `harm`: the absolute sequence lies below 0, and so does the relative one;
 * - `lift`: the always-valid p < α, the absolute sequence lies above 0, and so does the relative one;
 * - `flat` ("the confidence sequence excludes the minimum lift worth having", DESIGN.md §3): the
 *   relative sequence's upper end lies below `minimumRelativeLift` (the plan's relative minimum
 *   lift) and the absolute sequence's upper end lies below `minimumAbsoluteLift`
 *   (`baseline·minimumLift`, the line the lift chart draws); without a relative sequence, the
 *   absolute condition alone;
 * - `horizon`: the planned maximum duration (or sample size) is reached; else `collecting`.
 *
 * Why both sequences: the product prints the relative and the absolute sequence beside the call, so
 * a stop is made only when every printed sequence agrees with it. Each sequence covers its own
 * parameter at all times at once with probability ≥ 1 − α (Johari et al. 2022; Howard et al. 2021,
 * normal mixture), and a stop that needs both is a sub-event of the stop on either one, so each
 * guarantee still holds: P(lift or harm | no effect) ≤ α, P(flat | true relative lift ≥ minimum) ≤ α.
 * The price is a stop a little later when the two disagree near a boundary. The p-value is that of
 * the absolute sequence (p < α exactly when the running intersection excludes 0).
 *
 * Reference: DESIGN.md §3 "Calls"; Johari, Koomen, Pekelis & Walsh (2022), *Operations Research*
 * 70(3); Howard, Ramdas, McAuliffe & Sekhon (2021), *Annals of Statistics* 49(2). Complexity: O(1).
 *
 * @param input.healthy - false when a data-health check failed
 * @param input.p - always-valid p-value of the absolute sequence, in [0, 1]
 * @param input.cs - the running-intersected confidence sequence for the absolute lift
 * @param input.relativeCs - the running-intersected confidence sequence for the relative lift
 *   `m_T/m_C − 1` (−1 and +Infinity before it is estimable), or null when the campaign has none
 * @param input.significanceLevel - α of this arm (Bonferroni-adjusted), in (0, 1)
 * @param input.minimumAbsoluteLift - the smallest absolute lift worth having (> 0), or null
 * @param input.minimumRelativeLift - the smallest relative lift worth having (> 0), or null; with a
 *   relative sequence, null means no `flat`
 * @param input.horizonReached - the planned maximum duration (or planned sample size) is reached
 * @returns the {@link Call}
 * @throws RangeError when p is outside [0, 1] or an interval has a NaN end
 * @example decideCall({ healthy: true, p: 0.5, cs: [-0.001, 0.003], relativeCs: [-0.02, 0.12], significanceLevel: 0.05, minimumAbsoluteLift: 0.004, minimumRelativeLift: 0.1, horizonReached: false }) // "collecting" (the relative sequence still holds +10 %)
 */
export function decideCall(input: {
  healthy: boolean;
  p: number;
  cs: Interval;
  relativeCs: Interval | null;
  significanceLevel: number;
  minimumAbsoluteLift: number | null;
  minimumRelativeLift: number | null;
  horizonReached: boolean;
}): Call {
  if (!(input.p >= 0 && input.p <= 1)) throw new RangeError(`decideCall requires p in [0, 1], got ${input.p}`);
  const [lower, upper] = input.cs;
  if (Number.isNaN(lower) || Number.isNaN(upper)) throw new RangeError("decideCall requires a confidence sequence without NaN");
  const relative = input.relativeCs;
  if (relative !== null && (Number.isNaN(relative[0]) || Number.isNaN(relative[1]))) {
    throw new RangeError("decideCall requires a relative confidence sequence without NaN");
  }
  if (!input.healthy) return "suspect";
  if (upper < 0 && (relative === null || relative[1] < 0)) return "harm";
  if (input.p < input.significanceLevel && lower > 0 && (relative === null || relative[0] > 0)) return "lift";
  const absoluteFlat = input.minimumAbsoluteLift === null || upper < input.minimumAbsoluteLift;
  const minimumRelativeLift = input.minimumRelativeLift;
  const flat =
    relative === null
      ? input.minimumAbsoluteLift !== null && absoluteFlat
      : minimumRelativeLift !== null && relative[1] < minimumRelativeLift && absoluteFlat;
  if (flat) return "flat";
  if (input.horizonReached) return "horizon";
  return "collecting";
}
