import { describe, expect, it } from "vitest";
import { checkDailyCounts, dayNumber, formatDay, lookFractions, type DailyCountRow } from "@/lib/sequential";

const row = (date: string, arm: string, n: number, sum: number, sumSq = sum): DailyCountRow => Object.freeze({ date, arm, n, sum, sumSq });
const options = { metric: "conversion" as const, arms: ["holdout", "treatment"] };

describe("checkDailyCounts", () => {
  it("passes a clean series", () => {
    const rows = ["2026-03-01", "2026-03-02"].flatMap((date) => [row(date, "holdout", 100, 10), row(date, "treatment", 100, 12)]);
    expect(checkDailyCounts(rows, options)).toEqual([]);
  });
  it("reports each rule with the day it first affects", () => {
    const rows = [
      row("2026-03-01", "holdout", 100, 10),
      row("2026-03-01", "treatment", 100, 12),
      row("2026-03-01", "treatment", 5, 1),
      row("2026-03-02", "holdout", -3, 0),
      row("2026-03-02", "treatment", 10.5, 1),
      row("2026-03-04", "holdout", 10, 200),
      row("2026-03-04", "treatment", 10, 1),
      row("2026-03-04", "variant-x", 10, 1),
      row("2026-02-30", "holdout", 10, 1),
      row("2026-03-04", "holdout", 10, 1, 2),
      { date: "2026-03-04", arm: "treatment", n: NaN, sum: 1, sumSq: 1 },
    ];
    const rules = checkDailyCounts(rows, options).map((issue) => `${issue.date}:${issue.arm}:${issue.rule}`);
    expect(rules).toEqual(
      expect.arrayContaining([
        "null:holdout:invalid-date",
        "2026-03-01:treatment:duplicate-day",
        "2026-03-02:holdout:negative-count",
        "2026-03-02:treatment:non-integer-count",
        "2026-03-03:holdout:gap",
        "2026-03-03:treatment:gap",
        "2026-03-04:variant-x:unknown-arm",
        "2026-03-04:holdout:conversions-above-units",
        "2026-03-04:holdout:sum-squares-inconsistent",
        "2026-03-04:treatment:not-finite",
        "2026-03-04:holdout:duplicate-day",
      ]),
    );
    expect(rules[0]).toBe("null:holdout:invalid-date");
  });
  it("checks sums of squares of a mean metric", () => {
    const issues = checkDailyCounts([row("2026-03-01", "holdout", 4, 10, 20), row("2026-03-01", "treatment", 4, -8, 16)], { metric: "mean", arms: ["holdout", "treatment"] });
    expect(issues.map((issue) => issue.rule)).toEqual(["sum-squares-inconsistent"]);
  });
  it("throws a RangeError for each guard", () => {
    expect(() => checkDailyCounts(null as unknown as DailyCountRow[], options)).toThrow(/checkDailyCounts requires rows to be an array/);
    expect(() => checkDailyCounts([], { metric: "conversion", arms: [] })).toThrow(/checkDailyCounts requires at least one arm/);
  });
});

describe("dayNumber and formatDay", () => {
  it("round-trips every third day from 1900 to 2199 (against Date.UTC)", () => {
    for (let day = dayNumber("1900-01-01")!; day <= dayNumber("2199-12-31")!; day += 3) {
      expect(dayNumber(formatDay(day))).toBe(day);
    }
    expect(dayNumber("2024-02-29")).toBe(Date.UTC(2024, 1, 29) / 86_400_000);
    for (const bad of ["2026-02-29", "2026-13-01", "2026-1-01", "20260101", "2026-01-0x", ""]) expect(dayNumber(bad)).toBeNull();
    expect(() => formatDay(1.5)).toThrow(/formatDay requires an integer day number/);
  });
});

describe("lookFractions", () => {
  it("drops looks without new units and ends at 1", () => {
    expect(lookFractions([0, 100, 100, 200, 400])).toEqual([0.25, 0.5, 1]);
    expect(lookFractions([0, 0])).toEqual([]);
    expect(() => lookFractions([5, 3])).toThrow(/lookFractions requires non-decreasing units/);
    expect(() => lookFractions([-1])).toThrow(/lookFractions requires finite units ≥ 0/);
  });
});
