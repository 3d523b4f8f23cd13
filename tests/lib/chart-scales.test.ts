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
