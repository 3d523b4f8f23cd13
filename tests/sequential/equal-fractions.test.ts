import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { equalFractions } from "@/lib/sequential/equal-fractions";

describe("equalFractions", () => {
  it("gives k/K ending exactly at 1", () => {
    expect(equalFractions(1)).toEqual([1]);
    expect(equalFractions(4)).toEqual([0.25, 0.5, 0.75, 1]);
  });
  it("is strictly increasing in (0, 1] with K values", () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 500 }), (looks) => {
      const fractions = equalFractions(looks);
      expect(fractions).toHaveLength(looks);
      expect(fractions[looks - 1]).toBe(1);
      fractions.forEach((value, k) => expect(value).toBeGreaterThan(k === 0 ? 0 : fractions[k - 1]));
    }));
  });
  it("throws when looks is not an integer ≥ 1", () => {
    for (const looks of [0, -2, 1.5, Number.NaN, Infinity]) {
      expect(() => equalFractions(looks)).toThrow(new RangeError(`equalFractions requires an integer number of looks ≥ 1, got ${looks}`));
    }
  });
});
