/**
 * Days since 1970-01-01 of an ISO 8601 calendar day `YYYY-MM-DD` (UTC, no time zone shift), or null
 * when the text is not a real calendar day (e.g. `2026-02-30`).
 *
 * Reference: ISO 8601 calendar dates; proleptic Gregorian calendar, the days-from-civil algorithm
 * of Hinnant, "chrono-Compatible Low-Level Date Algorithms" (https://howardhinnant.github.io/date_algorithms.html).
 * Integer arithmetic only, no `Date` (this runs for every row of every campaign). Complexity: O(1).
 *
 * @param date - the day as `YYYY-MM-DD`
 * @returns an integer day number, or null for anything else
 * @example dayNumber("1970-01-02") // 1
 */
export function dayNumber(date: string): number | null {
  if (typeof date !== "string" || date.length !== 10 || date.charCodeAt(4) !== 45 || date.charCodeAt(7) !== 45) return null;
  const year = digits(date, 0, 4);
  const month = digits(date, 5, 7);
  const day = digits(date, 8, 10);
  if (year < 0 || month < 1 || month > 12 || day < 1) return null;
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  const length = month === 2 ? (leap ? 29 : 28) : month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
  if (day > length) return null;
  const shiftedYear = month <= 2 ? year - 1 : year;
  const era = Math.floor(shiftedYear / 400);
  const yearOfEra = shiftedYear - era * 400;
  const dayOfYear = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const dayOfEra = yearOfEra * 365 + Math.floor(yearOfEra / 4) - Math.floor(yearOfEra / 100) + dayOfYear;
  return era * 146097 + dayOfEra - 719468;
}

/** The decimal number in text[from, to), or −1 when a character is not a digit. */
function digits(text: string, from: number, to: number): number {
  let value = 0;
  for (let i = from; i < to; i++) {
    const code = text.charCodeAt(i) - 48;
    if (code < 0 || code > 9) return -1;
    value = value * 10 + code;
  }
  return value;
}
