import type { Call, Interval } from "./types";

/**
 * The daily call for one treatment arm, a pure function of that day's always-valid results:
 * `suspect` (a data-health check failed) > `harm` (the confidence sequence lies below 0) > `lift`
 * (always-valid p < α and the sequence lies above 0) > `flat` (the sequence's upper end lies
 * below the minimum absolute lift worth having, `baseline·minimumLift`) > `horizon` (planned
 * maximum duration or sample size reached) > `collecting`.
 *
 * Reference: DESIGN.md §3 "Calls"; the stops are valid at any day because the sequence covers the
 * lift at all times at once (Johari et al. 2022). Complexity: O(1).
 *
 * @param input.healthy - false when a data-health check failed
 * @param input.p - always-valid p-value in [0, 1]
 * @param input.cs - the (running-intersected) confidence sequence for the absolute lift
 * @param input.significanceLevel - α of this arm (Bonferroni-adjusted), in (0, 1)
 * @param input.minimumAbsoluteLift - the smallest absolute lift worth having (> 0), or null: no `flat`
 * @param input.horizonReached - the planned maximum duration (or planned sample size) is reached
 * @returns the {@link Call}
 * @throws RangeError when p is outside [0, 1] or the interval is NaN
 * @example decideCall({ healthy: true, p: 0.01, cs: [0.001, 0.02], significanceLevel: 0.05, minimumAbsoluteLift: 0.01, horizonReached: false }) // "lift"
 */
export function decideCall(input: {
  healthy: boolean;
  p: number;
  cs: Interval;
  significanceLevel: number;
  minimumAbsoluteLift: number | null;
  horizonReached: boolean;
}): Call {
  if (!(input.p >= 0 && input.p <= 1)) throw new RangeError(`decideCall requires p in [0, 1], got ${input.p}`);
  const [lower, upper] = input.cs;
  if (Number.isNaN(lower) || Number.isNaN(upper)) throw new RangeError("decideCall requires a confidence sequence without NaN");
  if (!input.healthy) return "suspect";
  if (upper < 0) return "harm";
  if (input.p < input.significanceLevel && lower > 0) return "lift";
  if (input.minimumAbsoluteLift !== null && upper < input.minimumAbsoluteLift) return "flat";
  if (input.horizonReached) return "horizon";
  return "collecting";
}
