import fc from "fast-check";
import { describe, expect, it } from "vitest";
import scipy from "../reference/fixtures/srm-reference.json";
import {
  chiSquareSurvival,
  dirichletMultinomialLogBayesFactor,
  logGamma,
  sampleRatioChiSquare,
  sequentialSampleRatioTest,
} from "@/lib/sequential";
import { closeRelative, TOLERANCE } from "./tolerance";

describe("sampleRatioChiSquare", () => {
  // scipy 1.10.1: stats.chisquare(counts, f_exp = total·shares) (tests/reference/srm-reference.py)
  for (const c of scipy.chiSquare) {
    it(`matches scipy chisquare for ${c.counts.join(",")} against ${c.shares.map((s) => s.toFixed(3)).join(",")}`, () => {
      const result = sampleRatioChiSquare(Object.freeze(c.counts), Object.freeze(c.shares));
      expect(closeRelative(result.statistic, c.statistic, 1e-12)).toBe(true);
      expect(closeRelative(result.p, c.p, TOLERANCE.pRelative)).toBe(true);
    });
  }
  it("throws a RangeError for each guard", () => {
    expect(() => sampleRatioChiSquare([1, 2], [0.5, 0.6])).toThrow(/sampleRatioChiSquare requires shares summing to 1/);
    expect(() => sampleRatioChiSquare([1, 2], [1])).toThrow(/sampleRatioChiSquare requires at least 2 shares/);
    expect(() => sampleRatioChiSquare([1, 2], [1.5, -0.5])).toThrow(/sampleRatioChiSquare requires every share > 0/);
    expect(() => sampleRatioChiSquare([1, 2, 3], [0.5, 0.5])).toThrow(/sampleRatioChiSquare requires one count per share/);
    expect(() => sampleRatioChiSquare([1, -2], [0.5, 0.5])).toThrow(/sampleRatioChiSquare requires counts to be non-negative integers/);
    expect(() => sampleRatioChiSquare([0, 0], [0.5, 0.5])).toThrow(/sampleRatioChiSquare requires at least one unit/);
  });
});

describe("chiSquareSurvival", () => {
  // scipy 1.10.1: stats.chi2.sf(x, df), including tails far below a CDF's rounding (tests/reference/srm-reference.py)
  for (const c of scipy.chiSquareTails) {
    it(`matches scipy chi2.sf(${c.statistic}, ${c.df})`, () => {
      expect(closeRelative(chiSquareSurvival(c.statistic, c.df), c.p, TOLERANCE.pRelative)).toBe(true);
    });
  }
  it("throws a RangeError for each guard", () => {
    expect(() => chiSquareSurvival(-1, 1)).toThrow(/chiSquareSurvival requires statistic ≥ 0/);
    expect(() => chiSquareSurvival(1, 0)).toThrow(/chiSquareSurvival requires degreesOfFreedom to be a positive integer/);
    expect(() => chiSquareSurvival(NaN, 1)).toThrow(/chiSquareSurvival requires statistic to be a finite number/);
  });
});

describe("logGamma", () => {
  // scipy 1.10.1: special.gammaln(z) (tests/reference/srm-reference.py)
  for (const c of scipy.logGamma) {
    it(`matches scipy gammaln(${c.z})`, () => {
      expect(Math.abs(logGamma(c.z) - c.value)).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(c.value)));
    });
  }
  it("throws a RangeError for z ≤ 0", () => {
    expect(() => logGamma(0)).toThrow(/logGamma requires z > 0/);
  });
});

describe("dirichletMultinomialLogBayesFactor (Lindon & Malek 2022)", () => {
  // Two arms: scipy 1.10.1 stats.betabinom.logpmf(x1, n, a1, a2) − stats.binom.logpmf(x1, n, θ1)
  for (const c of scipy.bayesFactorTwoArms) {
    it(`matches the beta-binomial ratio for ${c.counts.join(",")}, prior strength ${c.priorStrength}`, () => {
      const value = dirichletMultinomialLogBayesFactor(c.counts, c.shares, c.priorStrength);
      expect(Math.abs(value - c.logBayesFactor)).toBeLessThanOrEqual(1e-7 * Math.max(1, Math.abs(c.logBayesFactor)));
    });
  }
  // Three arms: the prior expectation of the likelihood ratio by scipy.integrate.dblquad over the simplex
  for (const c of scipy.bayesFactorThreeArms) {
    it(`matches the integral over the simplex for ${c.counts.join(",")}, prior strength ${c.priorStrength}`, () => {
      expect(closeRelative(Math.exp(dirichletMultinomialLogBayesFactor(c.counts, c.shares, c.priorStrength)), Math.exp(c.logBayesFactor), 1e-7)).toBe(true);
    });
  }
  it("gives an always-valid p-value that never rises and lies in [0, 1]", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.nat(500), fc.nat(500)), { minLength: 1, maxLength: 40 }), (increments) => {
        let a = 0;
        let b = 0;
        const looks = increments.map(([x, y]) => [(a += x), (b += y)]);
        const steps = sequentialSampleRatioTest(looks, [0.5, 0.5], 100);
        steps.forEach((step, i) => {
          expect(step.p >= 0 && step.p <= 1).toBe(true);
          if (i > 0) expect(step.p).toBeLessThanOrEqual(steps[i - 1].p);
        });
      }),
    );
  });
  it("throws a RangeError for each guard", () => {
    expect(() => dirichletMultinomialLogBayesFactor([1, 2], [0.5, 0.5], 0)).toThrow(/dirichletMultinomialLogBayesFactor requires priorStrength > 0/);
    expect(() => dirichletMultinomialLogBayesFactor([1.5, 2], [0.5, 0.5], 1)).toThrow(/requires counts to be non-negative integers/);
    expect(() => sequentialSampleRatioTest(null as unknown as number[][], [0.5, 0.5], 1)).toThrow(/sequentialSampleRatioTest requires an array/);
  });
});
