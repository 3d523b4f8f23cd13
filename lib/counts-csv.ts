import Papa from "papaparse";
import type { DailyCountRow, MetricKind } from "./sequential/types";
import { dayNumber } from "./sequential/day-number";

/** A parsed row with the line it came from (1 = the header). */
export interface CountsCsvRow extends DailyCountRow {
  readonly line: number;
}

/** A line that could not be read, and why. */
export interface CountsCsvError {
  readonly line: number;
  readonly reason: string;
}

/** What {@link parseCountsCsv} found: the metric named by the header, the good rows and the bad lines. */
export interface CountsCsvResult {
  readonly metric: MetricKind | null;
  readonly rows: CountsCsvRow[];
  readonly errors: CountsCsvError[];
}

/** The two accepted headers, in this order of columns. */
export const COUNTS_CSV_HEADERS = {
  conversion: ["date", "arm", "units", "conversions"],
  mean: ["date", "arm", "units", "sum", "sum_squares"],
} as const;

const ARM_KEY = /^[a-z0-9][a-z0-9_-]{0,63}$/i;
const WHOLE = /^\d{1,15}$/;
const DECIMAL = /^-?(\d{1,15}(\.\d*)?|\.\d+)([eE][+-]?\d{1,3})?$/;
const FORMULA_START = /^[=+@\t\r|]/;

/**
 * Parses a daily-counts CSV, the format of both the CLI and the product's upload: a header
 * `date,arm,units,conversions` (conversion metric) or `date,arm,units,sum,sum_squares` (mean
 * metric), then one row per day and arm with that day's new counts. Every bad line is reported
 * with its line number and reason (wrong column count, not a calendar day, bad arm key, a
 * formula-like or non-numeric cell, a negative or fractional count, a repeated day and arm); good
 * rows are returned even when others fail, so the caller decides. Runs in the browser and in node
 * (papaparse only). Line numbers count CSV records, the header being line 1.
 *
 * @param text - the file's text (a UTF-8 BOM is ignored)
 * @returns the metric (null when the header is not one of the two), the rows and the errors
 * @example parseCountsCsv("date,arm,units,conversions\n2026-03-01,holdout,100,7\n").rows[0] // { date: "2026-03-01", arm: "holdout", n: 100, sum: 7, sumSq: 7, line: 2 }
 */
export function parseCountsCsv(text: string): CountsCsvResult {
  if (typeof text !== "string") return { metric: null, rows: [], errors: [{ line: 0, reason: "the file is not text" }] };
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { header: false, skipEmptyLines: false });
  const records = parsed.data;
  const header = (records[0] ?? []).map((cell) => String(cell).trim().toLowerCase());
  const metric = matchHeader(header);
  if (metric === null) {
    return {
      metric: null,
      rows: [],
      errors: [{ line: 1, reason: `the header must be "${COUNTS_CSV_HEADERS.conversion.join(",")}" or "${COUNTS_CSV_HEADERS.mean.join(",")}", got "${header.join(",")}"` }],
    };
  }
  const columns = COUNTS_CSV_HEADERS[metric].length;
  const rows: CountsCsvRow[] = [];
  const errors: CountsCsvError[] = [];
  const firstLine = new Map<string, number>();
  for (let index = 1; index < records.length; index++) {
    const line = index + 1;
    // Only spaces are trimmed: a leading tab or CR is how a spreadsheet formula hides, and must be refused.
    const cells = records[index].map((cell) => String(cell).replace(/^ +| +$/g, ""));
    if (cells.length === 1 && cells[0] === "") continue;
    if (cells.length !== columns) {
      errors.push({ line, reason: `expected ${columns} columns, got ${cells.length}` });
      continue;
    }
    const reason = cellProblem(cells, metric);
    if (reason !== null) {
      errors.push({ line, reason });
      continue;
    }
    const [date, arm] = cells;
    const key = `${date}|${arm}`;
    const earlier = firstLine.get(key);
    if (earlier !== undefined) {
      errors.push({ line, reason: `arm ${arm} on ${date} repeats line ${earlier}` });
      continue;
    }
    firstLine.set(key, line);
    const n = Number(cells[2]);
    const sum = Number(cells[3]);
    const sumSq = metric === "conversion" ? sum : Number(cells[4]);
    rows.push({ date, arm, n, sum, sumSq, line });
  }
  return { metric, rows, errors };
}

function matchHeader(header: readonly string[]): MetricKind | null {
  for (const metric of ["conversion", "mean"] as const) {
    const expected = COUNTS_CSV_HEADERS[metric];
    if (header.length === expected.length && expected.every((name, i) => header[i] === name)) return metric;
  }
  return null;
}

function cellProblem(cells: readonly string[], metric: MetricKind): string | null {
  const names = COUNTS_CSV_HEADERS[metric];
  for (let i = 0; i < cells.length; i++) {
    if (FORMULA_START.test(cells[i]) || (cells[i].startsWith("-") && !DECIMAL.test(cells[i]))) {
      return `${names[i]} "${cells[i]}" looks like a spreadsheet formula`;
    }
  }
  const [date, arm, units, fourth, fifth] = cells;
  if (dayNumber(date) === null) return `date "${date}" is not a calendar day YYYY-MM-DD`;
  if (!ARM_KEY.test(arm)) return `arm "${arm}" must be 1–64 letters, digits, "-" or "_"`;
  if (!WHOLE.test(units)) return `units "${units}" must be a whole number ≥ 0`;
  if (metric === "conversion") {
    if (!WHOLE.test(fourth)) return `conversions "${fourth}" must be a whole number ≥ 0`;
    return null;
  }
  if (!DECIMAL.test(fourth) || !Number.isFinite(Number(fourth))) return `sum "${fourth}" must be a number`;
  if (!DECIMAL.test(fifth) || !Number.isFinite(Number(fifth)) || Number(fifth) < 0) return `sum_squares "${fifth}" must be a number ≥ 0`;
  const n = Number(units);
  const sum = Number(fourth);
  const sumSq = Number(fifth);
  if (n === 0 && (sum !== 0 || sumSq !== 0)) return "sum and sum_squares must be 0 when units is 0";
  if (n > 0 && sumSq < (sum * sum) / n - 1e-9 * Math.max(1, (sum * sum) / n)) return "sum_squares must be at least sum²/units";
  return null;
}
