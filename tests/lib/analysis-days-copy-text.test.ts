import { describe, expect, it } from "vitest";
import { AnalysisDaysCopyText, type AnalysisDayColumns } from "@/db/queries/recompute-batch";

function day(index: number, detailJson: string): AnalysisDayColumns {
  return {
    campaignId: "c0ffee00-0000-4000-8000-000000000000",
    day: `2026-03-${String(1 + (index % 28)).padStart(2, "0")}`,
    daysRun: index + 1,
    call: "collecting",
    numbers: [index / 7, null, -Infinity, Infinity, 1e-7, null, null, null, null, null, null, 0.0831],
    healthJson: '{"issues":[{"code":"x","message":"a\\\\b\tc\nd"}]}',
    detailJson,
    inputsHash: "ab12",
  };
}

/** One campaign's COPY text on its own, well inside the first buffer. */
function alone(days: readonly AnalysisDayColumns[]): Buffer {
  const text = new AnalysisDaysCopyText();
  text.append(days);
  const bytes = Buffer.from(Buffer.concat(text.chunks()));
  text.release();
  return bytes;
}

describe("AnalysisDaysCopyText", () => {
  it("holds the same bytes as each campaign written alone, past its first buffer and across a release", () => {
    // Multi-byte text and lines enough to outgrow the first 1 MiB buffer.
    const campaigns = Array.from({ length: 40 }, (_, c) => Array.from({ length: 90 }, (_, d) => day(d, `{"note":"Überhöhung ${c}·${d} ${"é".repeat(200)}"}`)));
    for (let round = 0; round < 2; round += 1) {
      const text = new AnalysisDaysCopyText();
      for (const days of campaigns) text.append(days);
      const expected = Buffer.concat(campaigns.map((days) => alone(days)));
      expect(expected.length).toBeGreaterThan(1 << 20);
      expect(Buffer.concat(text.chunks()).equals(expected)).toBe(true);
      text.release();
    }
  });

  it("has no chunks before any day is appended", () => {
    const text = new AnalysisDaysCopyText();
    expect(text.chunks()).toEqual([]);
    text.append([]);
    expect(text.chunks()).toEqual([]);
    text.release();
  });
});
