import { describe, expect, it } from "vitest";
import { COUNTS_CSV_HEADERS, parseCountsCsv } from "@/lib/counts-csv";

describe("parseCountsCsv", () => {
  it("reads a conversion file (BOM, spaces and a blank line allowed)", () => {
    const result = parseCountsCsv("\uFEFFdate, arm ,units,conversions\n2026-03-01,holdout,100,7\n\n2026-03-01,treatment,120,11\n");
    expect(result.metric).toBe("conversion");
    expect(result.errors).toEqual([]);
    expect(result.rows).toEqual([
      { date: "2026-03-01", arm: "holdout", n: 100, sum: 7, sumSq: 7, line: 2 },
      { date: "2026-03-01", arm: "treatment", n: 120, sum: 11, sumSq: 11, line: 4 },
    ]);
  });

  it("reads a mean-metric file", () => {
    const result = parseCountsCsv(`${COUNTS_CSV_HEADERS.mean.join(",")}\n2026-03-01,holdout,4,10.5,40.25\n2026-03-01,variant-b,3,-2,6\n`);
    expect(result.metric).toBe("mean");
    expect(result.errors).toEqual([]);
    expect(result.rows[1]).toEqual({ date: "2026-03-01", arm: "variant-b", n: 3, sum: -2, sumSq: 6, line: 3 });
  });

  it("reports every bad line with its number and reason, keeping the good ones", () => {
    const text = [
      "date,arm,units,conversions",
      "2026-03-01,holdout,100,7",
      "2026-03-01,treatment,=1+1,3",
      "2026-03-02,holdout,-5,1",
      "2026-02-30,holdout,5,1",
      "2026-03-01,holdout,100,7",
      "2026-03-03,treatment,1.5,1",
      "2026-03-03,treatment,4",
      "2026-03-04,hold out,4,1",
      "2026-03-04,treatment,@SUM(A1),1",
      "2026-03-04,treatment,10,-1+2",
      "2026-03-04,treatment,ten,1",
    ].join("\n");
    const result = parseCountsCsv(text);
    expect(result.rows).toHaveLength(1);
    expect(result.errors).toEqual([
      { line: 3, reason: 'units "=1+1" looks like a spreadsheet formula' },
      { line: 4, reason: 'units "-5" must be a whole number ≥ 0' },
      { line: 5, reason: 'date "2026-02-30" is not a calendar day YYYY-MM-DD' },
      { line: 6, reason: "arm holdout on 2026-03-01 repeats line 2" },
      { line: 7, reason: 'units "1.5" must be a whole number ≥ 0' },
      { line: 8, reason: "expected 4 columns, got 3" },
      { line: 9, reason: 'arm "hold out" must be 1–64 letters, digits, "-" or "_"' },
      { line: 10, reason: 'units "@SUM(A1)" looks like a spreadsheet formula' },
      { line: 11, reason: 'conversions "-1+2" looks like a spreadsheet formula' },
      { line: 12, reason: 'units "ten" must be a whole number ≥ 0' },
    ]);
  });

  it("rejects an unknown header and inconsistent sums of squares", () => {
    expect(parseCountsCsv("day,arm,units,conversions\n2026-03-01,holdout,1,0\n")).toEqual({
      metric: null,
      rows: [],
      errors: [{ line: 1, reason: 'the header must be "date,arm,units,conversions" or "date,arm,units,sum,sum_squares", got "day,arm,units,conversions"' }],
    });
    const mean = parseCountsCsv("date,arm,units,sum,sum_squares\n2026-03-01,holdout,10,5,1\n2026-03-01,treatment,0,1,1\n");
    expect(mean.errors.map((error) => error.reason)).toEqual(["sum_squares must be at least sum²/units", "sum and sum_squares must be 0 when units is 0"]);
    expect(parseCountsCsv(42 as unknown as string).errors).toEqual([{ line: 0, reason: "the file is not text" }]);
  });

  it("imports no node module (the browser upload reuses it)", async () => {
    const { readFileSync } = await import("node:fs");
    const source = readFileSync(new URL("../../lib/counts-csv.ts", import.meta.url), "utf8");
    expect(source).not.toMatch(/from "node:|require\(/);
  });
});
