import type { DailyCountRow, MetricKind } from "./types";
import { dayNumber } from "./day-number";
import { formatDay } from "./format-day";

/** Which data-health rule a row or a day breaks. */
export type HealthRule =
  | "invalid-date"
  | "unknown-arm"
  | "duplicate-day"
  | "not-finite"
  | "negative-count"
  | "non-integer-count"
  | "sum-squares-inconsistent"
  | "conversions-above-units"
  | "gap";

/** One data-health finding; `date` is the first day it affects (null: every day). */
export interface HealthIssue {
  readonly rule: HealthRule;
  readonly date: string | null;
  readonly arm: string;
  readonly message: string;
}

/**
 * Data-health checks on a campaign's daily counts (each row is that day's new counts of one arm):
 * invalid dates, unknown arms, two rows for the same arm and day, non-finite, negative or
 * non-integer counts, a sum of squares below sum²/n (mean metric) or different from the
 * conversions (conversion metric), cumulative conversions above cumulative units, and gaps — a
 * day between the first and last day of the campaign with no row for an arm (send zeros for a
 * day without traffic).
 *
 * Reference: DESIGN.md §3 "Data health"; Kohavi, Tang & Xu (2020), ch. 21 (trust checks before
 * any call). Complexity: O(rows · log rows + days · arms).
 *
 * @param rows - the daily rows, any order
 * @param options.metric - "conversion" or "mean"
 * @param options.arms - the plan's arm keys
 * @returns the issues, ordered by date (undated first)
 * @throws RangeError when rows is not an array or arms is empty
 * @example checkDailyCounts([{ date: "2026-03-01", arm: "holdout", n: 5, sum: 7, sumSq: 7 }], { metric: "conversion", arms: ["holdout"] })[0].rule // "conversions-above-units"
 */
export function checkDailyCounts(rows: readonly DailyCountRow[], options: { metric: MetricKind; arms: readonly string[] }): HealthIssue[] {
  if (!Array.isArray(rows)) throw new RangeError("checkDailyCounts requires rows to be an array");
  if (!Array.isArray(options.arms) || options.arms.length === 0) throw new RangeError("checkDailyCounts requires at least one arm");
  const issues: HealthIssue[] = [];
  const armIndex = new Map(options.arms.map((arm, index) => [arm, index]));
  const armCount = options.arms.length;
  const days = new Float64Array(rows.length);
  const arms = new Int32Array(rows.length).fill(-1);
  let first = Infinity;
  let last = -Infinity;
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    const arm = String(row?.arm);
    const day = dayNumber(row?.date);
    if (day === null) {
      issues.push({ rule: "invalid-date", date: null, arm, message: `arm ${arm}: "${String(row?.date)}" is not a calendar day YYYY-MM-DD` });
      continue;
    }
    const index = armIndex.get(arm);
    if (index === undefined) {
      issues.push({ rule: "unknown-arm", date: row.date, arm, message: `${row.date}: arm "${arm}" is not in the plan` });
      continue;
    }
    const problem = rowProblem(row, options.metric);
    if (problem) issues.push({ rule: problem.rule, date: row.date, arm, message: `${row.date}: arm ${arm}: ${problem.message}` });
    if (problem?.rule === "not-finite") continue;
    days[r] = day;
    arms[r] = index;
    if (day < first) first = day;
    if (day > last) last = day;
  }
  if (first === Infinity) return sortIssues(issues);
  const span = last - first + 1;
  const present = new Uint8Array(span * armCount);
  const units = options.metric === "conversion" ? new Float64Array(span * armCount) : null;
  const conversions = options.metric === "conversion" ? new Float64Array(span * armCount) : null;
  for (let r = 0; r < rows.length; r++) {
    if (arms[r] < 0) continue;
    const cell = (days[r] - first) * armCount + arms[r];
    if (present[cell] === 1) issues.push({ rule: "duplicate-day", date: rows[r].date, arm: rows[r].arm, message: `${rows[r].date}: arm ${rows[r].arm} has more than one row` });
    present[cell] = 1;
    if (units && conversions) {
      units[cell] += rows[r].n;
      conversions[cell] += rows[r].sum;
    }
  }
  for (let a = 0; a < armCount; a++) {
    let cumulativeUnits = 0;
    let cumulativeConversions = 0;
    let flagged = false;
    for (let d = 0; d < span; d++) {
      const cell = d * armCount + a;
      if (present[cell] === 0) {
        const date = formatDay(first + d);
        issues.push({ rule: "gap", date, arm: options.arms[a], message: `${date}: arm ${options.arms[a]} has no row (send 0 for a day without traffic)` });
      }
      if (units && conversions && !flagged) {
        cumulativeUnits += units[cell];
        cumulativeConversions += conversions[cell];
        if (cumulativeConversions > cumulativeUnits) {
          flagged = true;
          const date = formatDay(first + d);
          issues.push({
            rule: "conversions-above-units",
            date,
            arm: options.arms[a],
            message: `${date}: arm ${options.arms[a]} has ${cumulativeConversions} cumulative conversions for ${cumulativeUnits} units`,
          });
        }
      }
    }
  }
  return sortIssues(issues);
}

function sortIssues(issues: HealthIssue[]): HealthIssue[] {
  return issues.length < 2 ? issues : issues.sort((a, b) => (a.date ?? "").localeCompare(b.date ?? ""));
}

function rowProblem(row: DailyCountRow, metric: MetricKind): { rule: HealthRule; message: string } | null {
  const { n, sum, sumSq } = row;
  if (!Number.isFinite(n) || !Number.isFinite(sum) || !Number.isFinite(sumSq)) {
    return { rule: "not-finite", message: "counts must be finite numbers" };
  }
  if (n < 0 || sumSq < 0 || (metric === "conversion" && sum < 0)) return { rule: "negative-count", message: "counts must not be negative" };
  if (!Number.isInteger(n) || (metric === "conversion" && !Number.isInteger(sum))) {
    return { rule: "non-integer-count", message: metric === "conversion" ? "units and conversions must be whole numbers" : "units must be a whole number" };
  }
  if (metric === "conversion" && sumSq !== sum) return { rule: "sum-squares-inconsistent", message: "sumSq must equal the conversions for a conversion metric" };
  if (metric === "mean" && (n > 0 ? sumSq < (sum * sum) / n - 1e-9 * Math.max(1, (sum * sum) / n) : sum !== 0 || sumSq !== 0)) {
    return { rule: "sum-squares-inconsistent", message: "sum of squares must be at least sum²/units (and 0 without units)" };
  }
  return null;
}
