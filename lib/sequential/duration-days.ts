import { requireFinite } from "./require-finite";

/**
 * Planned duration in whole days: the days needed for `totalUnits` at `dailyUnits` a day, rounded up.
 *
 * Reference: none needed (arithmetic); assumes steady daily traffic. Complexity: O(1).
 *
 * @param totalUnits - units the plan needs over all arms, ≥ 0
 * @param dailyUnits - expected units a day over all arms, > 0
 * @returns days, an integer ≥ 0
 * @throws RangeError when totalUnits < 0 or dailyUnits ≤ 0 (or either is not finite)
 * @example durationDays(29498, 2000) // 15
 */
export function durationDays(totalUnits: number, dailyUnits: number): number {
  requireFinite("durationDays", "totalUnits", totalUnits);
  requireFinite("durationDays", "dailyUnits", dailyUnits);
  if (totalUnits < 0) throw new RangeError(`durationDays requires totalUnits ≥ 0, got ${totalUnits}`);
  if (dailyUnits <= 0) throw new RangeError(`durationDays requires dailyUnits > 0, got ${dailyUnits}`);
  return Math.ceil(totalUnits / dailyUnits);
}
