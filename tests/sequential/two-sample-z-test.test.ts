import fc from "fast-check";
import { describe, expect, it } from "vitest";
import statsmodels from "../reference/fixtures/fixed-ztest.json";
import rProp from "../reference/fixtures/fixed-prop-test.json";
import { twoSampleZTest, zTestPValue } from "@/lib/sequential";
import { closeRelative, TOLERANCE } from "./tolerance";

const arm = (x: number, n: number) => Object.freeze({ n, sum: x, sumSq: x });

describe("twoSampleZTest — conversion metric", () => {
  // statsmodels 0.13.5: proportions_ztest([xT, xC], [nT, nC], alternative) (pooled);
  // test_proportions_2indep(xT, nT, xC, nC, method="wald", compare="diff", alternative) (unpooled);
  // confint_proportions_2indep(..., method="wald", compare="diff") and (..., method="log", compare="ratio"). Script: tests/reference/fixed-ztest.py
  for (const c of statsmodels.proportions) {
    it(`matches statsmodels for ${c.treatment.join("/")} vs ${c.holdout.join("/")}, ${c.sides}-sided`, () => {
      const result = twoSampleZTest(arm(c.treatment[0], c.treatment[1]), arm(c.holdout[0], c.holdout[1]), {
        sides: c.sides as 1 | 2,
        significanceLevel: c.alpha,
      });
      expect(Math.abs(result.pooled.z - c.pooled.z)).toBeLessThanOrEqual(TOLERANCE.z);
      expect(closeRelative(result.pooled.p, c.pooled.p, TOLERANCE.pRelative)).toBe(true);
      if (c.unpooled) {
        expect(Math.abs(result.unpooled.z - c.unpooled.z)).toBeLessThanOrEqual(TOLERANCE.z);
        expect(closeRelative(result.unpooled.p, c.unpooled.p, TOLERANCE.pRelative)).toBe(true);
      }
      if (c.ciAbsolute) {
        expect(Math.abs(result.ci.absolute[0] - c.ciAbsolute[0])).toBeLessThanOrEqual(1e-12);
        expect(Math.abs(result.ci.absolute[1] - c.ciAbsolute[1])).toBeLessThanOrEqual(1e-12);
      }
      if (c.ciRelative) {
        expect(result.ci.relative).not.toBeNull();
        expect(Math.abs(result.ci.relative![0] - c.ciRelative[0])).toBeLessThanOrEqual(1e-12);
        expect(Math.abs(result.ci.relative![1] - c.ciRelative[1])).toBeLessThanOrEqual(1e-12);
      }
      if (c.sides === 1) expect(result.ci.absolute[1]).toBe(Infinity);
    });
  }

  // R 4.2.2: prop.test(c(xT, xC), c(nT, nC), correct = FALSE) — X-squared = z², p two-sided;
  // alternative = "greater" for the one-sided p. Script: tests/reference/fixed-prop-test.R
  for (const c of rProp.cases) {
    it(`matches R prop.test for ${c.treatment.join("/")} vs ${c.holdout.join("/")}`, () => {
      const two = twoSampleZTest(arm(c.treatment[0], c.treatment[1]), arm(c.holdout[0], c.holdout[1]));
      const one = twoSampleZTest(arm(c.treatment[0], c.treatment[1]), arm(c.holdout[0], c.holdout[1]), { sides: 1 });
      expect(closeRelative(two.pooled.z ** 2, c.xSquared, 1e-12)).toBe(true);
      expect(closeRelative(two.pooled.p, c.pTwoSided, TOLERANCE.pRelative)).toBe(true);
      expect(closeRelative(one.pooled.p, c.pGreater, TOLERANCE.pRelative)).toBe(true);
    });
  }
});

describe("twoSampleZTest — mean metric", () => {
  // statsmodels 0.13.5: CompareMeans.from_data(x, y).ztest_ind(usevar="pooled" | "unequal", alternative)
  // and .zconfint_diff(alpha, usevar="unequal") on gamma-distributed revenue (tests/reference/fixed-ztest.py).
  for (const c of statsmodels.means) {
    it(`matches statsmodels for n = ${c.treatment.n} vs ${c.holdout.n}, ${c.sides}-sided`, () => {
      const result = twoSampleZTest(Object.freeze(c.treatment), Object.freeze(c.holdout), {
        metric: "mean",
        sides: c.sides as 1 | 2,
        significanceLevel: c.alpha,
      });
      expect(Math.abs(result.pooled.z - c.pooled.z)).toBeLessThanOrEqual(TOLERANCE.z);
      expect(closeRelative(result.pooled.p, c.pooled.p, TOLERANCE.pRelative)).toBe(true);
      expect(Math.abs(result.unpooled.z - c.unpooled.z)).toBeLessThanOrEqual(TOLERANCE.z);
      expect(closeRelative(result.unpooled.p, c.unpooled.p, TOLERANCE.pRelative)).toBe(true);
      if (c.ciAbsolute) {
        expect(Math.abs(result.ci.absolute[0] - c.ciAbsolute[0])).toBeLessThanOrEqual(1e-9);
        expect(Math.abs(result.ci.absolute[1] - c.ciAbsolute[1])).toBeLessThanOrEqual(1e-9);
      }
    });
  }
});

describe("twoSampleZTest — properties and guards", () => {
  it("gives p-values in [0, 1] and an interval around the lift", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 100000 }),
        fc.integer({ min: 1, max: 100000 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.constantFrom(1 as const, 2 as const),
        (nT, nC, rT, rC, sides) => {
          const result = twoSampleZTest(arm(Math.round(rT * nT), nT), arm(Math.round(rC * nC), nC), { sides });
          for (const p of [result.pooled.p, result.unpooled.p]) expect(p >= 0 && p <= 1).toBe(true);
          expect(result.ci.absolute[0]).toBeLessThanOrEqual(result.absolute);
          expect(result.ci.absolute[1]).toBeGreaterThanOrEqual(result.absolute);
        },
      ),
    );
  });

  it("grows |z| with the sample at a fixed lift (monotone in n)", () => {
    let previous = 0;
    for (const n of [100, 1000, 10000, 100000]) {
      const z = twoSampleZTest(arm(0.12 * n, n), arm(0.1 * n, n)).pooled.z;
      expect(z).toBeGreaterThan(previous);
      previous = z;
    }
  });

  it("gives z = 0 and p = 1 when both arms have no conversions", () => {
    const result = twoSampleZTest(arm(0, 50), arm(0, 50));
    expect(result.pooled).toEqual({ z: 0, p: 1 });
    expect(result.ci.relative).toBeNull();
  });

  it("throws a RangeError naming the rule for each guard", () => {
    expect(() => twoSampleZTest(arm(1, 0), arm(1, 10))).toThrow(/twoSampleZTest requires treatment conversions/);
    expect(() => twoSampleZTest(arm(11, 10), arm(1, 10))).toThrow(/twoSampleZTest requires treatment conversions to be an integer in \[0, n\]/);
    expect(() => twoSampleZTest(arm(1, 10), { n: 10.5, sum: 1, sumSq: 1 })).toThrow(/twoSampleZTest requires holdout n to be a non-negative integer/);
    expect(() => twoSampleZTest(arm(1, 10), { n: 10, sum: NaN, sumSq: 1 })).toThrow(/twoSampleZTest requires holdout finite/);
    expect(() => twoSampleZTest(arm(1, 10), { n: 10, sum: 1, sumSq: 2 })).toThrow(/sumSq = sum/);
    expect(() => twoSampleZTest(arm(1, 10), arm(1, 10), { sides: 3 as 1 })).toThrow(/twoSampleZTest requires sides 1 or 2/);
    expect(() => twoSampleZTest(arm(1, 10), arm(1, 10), { significanceLevel: 1 })).toThrow(/twoSampleZTest requires significanceLevel in \(0, 1\)/);
    expect(() => twoSampleZTest({ n: 1, sum: 1, sumSq: 1 }, { n: 5, sum: 5, sumSq: 6 }, { metric: "mean" })).toThrow(/requires treatment.n ≥ 2/);
    expect(() => twoSampleZTest({ n: 3, sum: 6, sumSq: 1 }, { n: 5, sum: 5, sumSq: 6 }, { metric: "mean" })).toThrow(/sumSq ≥ sum²\/n/);
    expect(() => zTestPValue(NaN, 2)).toThrow(/zTestPValue requires z/);
  });
});
