import fc from "fast-check";
import { describe, expect, it } from "vitest";
import r from "../reference/fixtures/exact-tests.json";
import scipy from "../reference/fixtures/exact-tests-scipy.json";
import { binomialProbability, exactBinomialTest, fisherExactTest, hypergeometricProbability, type ExactAlternative } from "@/lib/sequential";
import { closeRelative, TOLERANCE } from "./tolerance";

const alternative = (name: string) => (name === "two.sided" ? "two-sided" : name) as ExactAlternative;

describe("exactBinomialTest", () => {
  // R 4.2.2: binom.test(x, n, p, alternative)$p.value (tests/reference/exact-tests.R)
  for (const c of r.binomial) {
    it(`matches R binom.test(${c.x}, ${c.n}, ${c.p}, "${c.alternative}")`, () => {
      expect(closeRelative(exactBinomialTest(c.x, c.n, Number(c.p), alternative(c.alternative)), Number(c.pValue), TOLERANCE.pRelative)).toBe(true);
    });
  }
  // scipy 1.10.1: binomtest(x, n, p, alternative).pvalue (tests/reference/exact-tests.py)
  for (const c of scipy.binomial) {
    it(`matches scipy binomtest(${c.x}, ${c.n}, ${c.p}, "${c.alternative}")`, () => {
      expect(closeRelative(exactBinomialTest(c.x, c.n, c.p, c.alternative as ExactAlternative), c.pValue, TOLERANCE.pRelative)).toBe(true);
    });
  }
  it("keeps tiny tails that a rounded CDF would lose", () => {
    // P(X ≥ 40) for Binomial(1000, 0.01) by direct summation of the masses, to compare in log space
    let tail = 0;
    for (let k = 40; k <= 1000; k++) tail += binomialProbability(k, 1000, 0.01);
    expect(closeRelative(exactBinomialTest(40, 1000, 0.01, "greater"), tail, 1e-12)).toBe(true);
    expect(tail).toBeLessThan(1e-10);
    expect(tail).toBeGreaterThan(0);
  });
  it("gives p-values in [0, 1]", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 400 }), fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (n, p, share) => {
        const x = Math.round(share * n);
        for (const a of ["two-sided", "greater", "less"] as const) {
          const value = exactBinomialTest(x, n, p, a);
          expect(value >= 0 && value <= 1).toBe(true);
        }
      }),
    );
  });
  it("throws a RangeError for each guard", () => {
    expect(() => exactBinomialTest(3, 0, 0.5)).toThrow(/exactBinomialTest requires trials to be a positive integer/);
    expect(() => exactBinomialTest(11, 10, 0.5)).toThrow(/exactBinomialTest requires successes to be an integer in \[0, trials\]/);
    expect(() => exactBinomialTest(1.5, 10, 0.5)).toThrow(/successes/);
    expect(() => exactBinomialTest(1, 10, 0)).toThrow(/exactBinomialTest requires probability in \(0, 1\)/);
    expect(() => exactBinomialTest(1, 10, 0.5, "up" as ExactAlternative)).toThrow(/alternative/);
    expect(() => binomialProbability(1, -1, 0.5)).toThrow(/binomialProbability requires trials/);
    expect(() => binomialProbability(1, 3, 1.5)).toThrow(/binomialProbability requires probability/);
  });
});

describe("fisherExactTest", () => {
  // R 4.2.2: fisher.test(matrix(c(a, c, b, d), 2), alternative)$p.value (tests/reference/exact-tests.R);
  // R's estimate is the conditional MLE of the odds ratio, not compared (we report the sample odds ratio).
  for (const c of r.fisher) {
    it(`matches R fisher.test for ${JSON.stringify(c.table)}, "${c.alternative}"`, () => {
      const table = c.table as [[number, number], [number, number]];
      expect(closeRelative(fisherExactTest(table, alternative(c.alternative)).p, Number(c.pValue), TOLERANCE.pRelative)).toBe(true);
    });
  }
  // scipy 1.10.1: fisher_exact(table, alternative) -> (sample odds ratio, p) (tests/reference/exact-tests.py)
  for (const c of scipy.fisher) {
    it(`matches scipy fisher_exact for ${JSON.stringify(c.table)}, "${c.alternative}"`, () => {
      const result = fisherExactTest(c.table as [[number, number], [number, number]], c.alternative as ExactAlternative);
      expect(closeRelative(result.p, c.pValue, TOLERANCE.pRelative)).toBe(true);
      expect(closeRelative(result.oddsRatio, c.sampleOddsRatio, 1e-12)).toBe(true);
    });
  }
  it("sums the hypergeometric masses to 1", () => {
    let total = 0;
    for (let x = 0; x <= 40; x++) total += hypergeometricProbability(x, 40, 60, 45);
    expect(Math.abs(total - 1)).toBeLessThan(1e-13);
  });
  it("throws a RangeError for each guard", () => {
    expect(() => fisherExactTest([[1, 2]] as unknown as [[number, number], [number, number]])).toThrow(/fisherExactTest requires a 2×2 table/);
    expect(() => fisherExactTest([[1, -2], [3, 4]])).toThrow(/fisherExactTest requires non-negative integer cells/);
    expect(() => fisherExactTest([[1, NaN], [3, 4]])).toThrow(/fisherExactTest requires a table cell to be a finite number/);
    expect(() => fisherExactTest([[1, 2], [3, 4]], "both" as ExactAlternative)).toThrow(/alternative/);
    expect(() => hypergeometricProbability(1, 2, 2, 5)).toThrow(/hypergeometricProbability requires non-negative counts with drawn ≤ white \+ black/);
  });
});
