/**
 * ISO 8601 calendar day `YYYY-MM-DD` of a day number (days since 1970-01-01, UTC); the inverse of
 * {@link dayNumber}.
 *
 * Reference: ISO 8601. Complexity: O(1).
 *
 * @param day - an integer day number
 * @returns the day as `YYYY-MM-DD`
 * @throws RangeError when day is not an integer
 * @example formatDay(1) // "1970-01-02"
 */
export function formatDay(day: number): string {
  if (!Number.isInteger(day)) throw new RangeError(`formatDay requires an integer day number, got ${day}`);
  return new Date(day * 86_400_000).toISOString().slice(0, 10);
}
