import { describe, expect, it } from "vitest";
import { axisFraction, categoryTicks, linearAxis } from "@/components/charts/scales";

describe("chart scales", () => {
  it("starts a positive axis at zero and ends it on a round tick above the largest value", () => {
    expect(linearAxis([0, 120_000, 1_620_000])).toEqual({ domain: [0, 2_000_000], ticks: [0, 500_000, 1_000_000, 1_500_000, 2_000_000] });
  });

  it("widens to round ticks on both sides of zero", () => {
    const axis = linearAxis([-1.7, 0.4, 2.6, null, Number.NaN]);
    expect(axis.domain).toEqual([-2, 4]);
    expect(axis.ticks).toEqual([-2, 0, 2, 4]);
  });

  it("keeps a minimum top for small values", () => {
    expect(linearAxis([0.05, 0.08], { minimumTop: 0.1 }).domain[1]).toBeCloseTo(0.1, 12);
  });

  it("picks evenly spread labels including the first and the last", () => {
    const days = Array.from({ length: 90 }, (_, index) => `d${index}`);
    expect(categoryTicks(days)).toEqual(["d0", "d18", "d36", "d53", "d71", "d89"]);
    expect(categoryTicks(["a", "b"])).toEqual(["a", "b"]);
  });

  it("places values on linear and log axes, clamped to the domain", () => {
    expect(axisFraction(5, [0, 10])).toBe(0.5);
    expect(axisFraction(1e-3, [1e-6, 1], "log")).toBeCloseTo(0.5, 12);
    expect(axisFraction(1e-9, [1e-6, 1], "log")).toBe(0);
  });
});

describe("still plot", () => {
  it("draws every finite point of each line in the server HTML, breaking the line at gaps", async () => {
    const { createElement } = await import("react");
    const { renderToStaticMarkup } = await import("react-dom/server");
    const { StillPlot } = await import("@/components/charts/static-plot");
    const html = renderToStaticMarkup(
      createElement(StillPlot, {
        label: "Lift over time",
        points: 4,
        xTicks: [{ index: 0, text: "2026-09-01" }],
        y: { domain: [0, 10], ticks: [0, 5, 10], format: String, width: 56 },
        lines: [{ values: [0, 5, null, 10], colour: "--treatment", width: 2 }],
      }),
    );
    expect(html).toContain('role="img" aria-label="Lift over time"');
    expect(html).toContain('d="M0.0,1000.0L333.3,500.0M1000.0,0.0"');
  });
});
