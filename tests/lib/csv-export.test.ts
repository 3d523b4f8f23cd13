import { describe, expect, it } from "vitest";
import { csvCell, csvFileName, toCsv } from "@/lib/csv-export";

describe("csv export", () => {
  it("escapes text cells that begin like a formula (=, +, -, @, tab, carriage return)", () => {
    expect(csvCell("=HYPERLINK(\"http://x\")")).toBe("\"'=HYPERLINK(\"\"http://x\"\")\"");
    expect(csvCell("+1")).toBe("'+1");
    expect(csvCell("-2")).toBe("'-2");
    expect(csvCell("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(csvCell("\tcmd")).toBe("'\tcmd");
    expect(csvCell("Trail shoe spring e-mail")).toBe("Trail shoe spring e-mail");
  });

  it("writes numbers as numbers, including negative lifts, and empties what is not finite", () => {
    expect(csvCell(-0.0123)).toBe("-0.0123");
    expect(csvCell(0)).toBe("0");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(Number.POSITIVE_INFINITY)).toBe("");
    expect(csvCell(null)).toBe("");
    expect(csvCell(undefined)).toBe("");
  });

  it("quotes commas, quotes and line breaks (RFC 4180) and ends lines with CRLF", () => {
    expect(toCsv(["day", "note"], [["2026-03-01", 'a "quoted", note'], ["2026-03-02", "two\nlines"]])).toBe(
      'day,note\r\n2026-03-01,"a ""quoted"", note"\r\n2026-03-02,"two\nlines"\r\n',
    );
  });

  it("names files safely", () => {
    expect(csvFileName("Trail shoe spring e-mail", "lift")).toBe("trail-shoe-spring-e-mail-lift.csv");
    expect(csvFileName("../../etc")).toBe("etc.csv");
    expect(csvFileName("")).toBe("export.csv");
  });
});
