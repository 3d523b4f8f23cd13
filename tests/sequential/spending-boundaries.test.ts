import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { equalFractions } from "@/lib/sequential/equal-fractions";
import { crossingProbabilities } from "@/lib/sequential/recursive-integration-crossing";
import { spendingBoundaries } from "@/lib/sequential/spending-boundaries";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";
import { TOLERANCE } from "./tolerance";

const spendingOf = { asOF: "obf", asP: "pocock", asHSD: "hsd" } as const;

/** rpact's integration is good to about 1e-9 in probability, which cannot pin z to 1e-4 where a look spends little. */
const RPACT_SMALLEST_SPEND = 1e-5;

describe("spendingBoundaries against R's rpact", () => {
  // tests/reference/rpact-spending-boundaries.R, rpact 3.3.4 on R 4.2.2; the exact call of each case
  // is its title: getDesignGroupSequential(...)$criticalValues and $alphaSpent.
  // Looks spending under 1e-5 (early O'Brien–Fleming-type looks) are skipped: rpact computes
  // 1 − pnorm(x) there (its alphaSpent is 6.7e-16 where the function gives 1.2e-23) and its z at
  // look 2 of kMax = 10, asOF, sided = 2 is 4.87702 against our 4.87689; R's mvtnorm
  // (pmvnorm, Miwa(steps = 4096), corr √(1/2)) gives the crossing 1.07773976e-6 at our z against the
  // target 1.07773980e-6, and 1.07698e-6 at rpact's.
  for (const reference of rpact.spending) {
    it(reference.call, () => {
      const result = spendingBoundaries({
        informationFractions: Object.freeze([...reference.informationRates]),
        significanceLevel: reference.alpha,
        sides: reference.sided as 1 | 2,
        spending: spendingOf[reference.typeOfDesign as keyof typeof spendingOf],
        gamma: reference.gamma ?? undefined,
      });
      result.z.forEach((value, k) => {
        const spend = result.cumulativeAlpha[k] - (k === 0 ? 0 : result.cumulativeAlpha[k - 1]);
        if (spend < RPACT_SMALLEST_SPEND) return;
        expect(Math.abs(value - (reference.criticalValues[k] as number))).toBeLessThanOrEqual(TOLERANCE.boundary);
      });
      // rpact's alphaSpent carries the same 1 − pnorm rounding (≤ 1e-15 absolute) and a last value of 4.999999e-02
      result.cumulativeAlpha.forEach((value, k) => expect(Math.abs(value - reference.alphaSpent[k])).toBeLessThanOrEqual(1e-6 * reference.alpha));
    });
  }
});

describe("spendingBoundaries properties", () => {
  const design = fc.record({
    raw: fc.uniqueArray(fc.integer({ min: 1, max: 99 }), { maxLength: 8 }),
    significanceLevel: fc.double({ min: 0.001, max: 0.2, noNaN: true }),
    sides: fc.constantFrom<1 | 2>(1, 2),
    spending: fc.constantFrom<"obf" | "pocock" | "hsd">("obf", "pocock", "hsd"),
    gamma: fc.constantFrom(-4, -2, 1, 2),
  });
  const fractionsOf = (raw: number[]) => [...raw.map((value) => value / 100), 1].sort((a, b) => a - b);

  it("cumulative α is non-decreasing and reaches α at t = 1", () => {
    fc.assert(
      fc.property(design, ({ raw, ...options }) => {
        const { cumulativeAlpha, z } = spendingBoundaries({ informationFractions: fractionsOf(raw), ...options });
        for (let k = 1; k < cumulativeAlpha.length; k += 1) expect(cumulativeAlpha[k]).toBeGreaterThanOrEqual(cumulativeAlpha[k - 1]);
        expect(cumulativeAlpha[cumulativeAlpha.length - 1]).toBe(options.significanceLevel);
        for (const value of z) expect(Number.isNaN(value)).toBe(false);
      }),
      { numRuns: 30 },
    );
  });

  it("the boundaries spend exactly the cumulative α (recomputed crossing probabilities)", () => {
    fc.assert(
      fc.property(design, ({ raw, ...options }) => {
        const fractions = fractionsOf(raw);
        const { cumulativeAlpha, z } = spendingBoundaries({ informationFractions: fractions, ...options });
        const lower = options.sides === 2 ? "symmetric" : fractions.map(() => -Infinity);
        const crossing = crossingProbabilities(fractions, z, lower).total;
        crossing.forEach((value, k) => expect(Math.abs(value - cumulativeAlpha[k])).toBeLessThan(1e-8));
      }),
      { numRuns: 20 },
    );
  });

  it("one look gives the fixed-horizon critical value", () => {
    expect(spendingBoundaries({ informationFractions: [1], significanceLevel: 0.05, spending: "obf" }).z[0]).toBeCloseTo(1.959963984540054, 12);
    expect(spendingBoundaries({ informationFractions: [1], significanceLevel: 0.05, sides: 1, spending: "pocock" }).z[0]).toBeCloseTo(1.6448536269514722, 12);
  });

  it("gives +Infinity, not NaN, where nothing is left to spend", () => {
    const { z, cumulativeAlpha } = spendingBoundaries({ informationFractions: [0.0005, 0.5, 1], significanceLevel: 0.05, spending: "obf" });
    expect(cumulativeAlpha[0]).toBe(0);
    expect(z[0]).toBe(Infinity);
    expect(Number.isFinite(z[1]) && Number.isFinite(z[2])).toBe(true);
  });

  it("20 equally spaced looks are computed (timing is in bench/group-sequential.ts)", () => {
    expect(spendingBoundaries({ informationFractions: equalFractions(20), significanceLevel: 0.05, spending: "obf" }).z).toHaveLength(20);
  });
});

describe("spendingBoundaries guards", () => {
  const base = { informationFractions: [0.5, 1], significanceLevel: 0.05, spending: "obf" as const };
  it("rejects an empty schedule", () => {
    expect(() => spendingBoundaries({ ...base, informationFractions: [] })).toThrow("spendingBoundaries requires at least one information fraction");
  });
  it("rejects fractions that are not strictly increasing in (0, 1]", () => {
    for (const informationFractions of [[0.5, 0.5, 1], [0, 1], [0.5, 1.5], [Number.NaN, 1]]) {
      expect(() => spendingBoundaries({ ...base, informationFractions })).toThrow(new RangeError(`spendingBoundaries requires strictly increasing information fractions in (0, 1], got ${informationFractions.find((value, k, all) => !(value > (k ? all[k - 1] : 0) && value <= 1))}`));
    }
  });
  it("rejects a last fraction other than 1", () => {
    expect(() => spendingBoundaries({ ...base, informationFractions: [0.4, 0.8] })).toThrow("spendingBoundaries requires the last information fraction to be 1");
  });
  it("rejects α outside (0, 1)", () => {
    for (const significanceLevel of [0, 1, 2, Number.NaN]) {
      expect(() => spendingBoundaries({ ...base, significanceLevel })).toThrow("spendingBoundaries requires a significanceLevel in (0, 1)");
    }
  });
  it("rejects sides other than 1 or 2", () => {
    expect(() => spendingBoundaries({ ...base, sides: 0 as 1 })).toThrow("spendingBoundaries requires sides 1 or 2");
  });
  it("rejects an unknown spending function", () => {
    expect(() => spendingBoundaries({ ...base, spending: "linear" as "obf" })).toThrow('spendingBoundaries requires spending "obf", "pocock" or "hsd"');
  });
  it("rejects hsd without a finite non-zero gamma", () => {
    for (const gamma of [undefined, 0, Number.NaN, Infinity]) {
      expect(() => spendingBoundaries({ ...base, spending: "hsd", gamma })).toThrow('spendingBoundaries requires a finite non-zero gamma for "hsd" spending');
    }
  });
});
