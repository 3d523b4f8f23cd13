import { describe, expect, it } from "vitest";
import r from "../reference/fixtures/plan-sample-size.json";
import statsmodels from "../reference/fixtures/plan-sample-size-statsmodels.json";
import { durationDays, sampleSizeTwoMeans, sampleSizeTwoProportions, tauFromPlan, widthOptimalTau } from "@/lib/sequential";
import { closeRelative } from "./tolerance";

const nearInteger = (value: number) => Math.abs(value - Math.round(value)) < 1e-6 * value;

describe("sampleSizeTwoProportions", () => {
  // R 4.2.2: power.prop.test(p1 = baseline, p2 = baseline·(1 + lift), sig.level, power, alternative, tol = 1e-12)$n
  // (tests/reference/plan-sample-size.R). Same formula, so the unrounded n agrees to the root finder's
  // precision and the ceilings are equal (exactly, away from an integer).
  for (const c of r.cases) {
    it(`matches power.prop.test for baseline ${c.baseline}, lift ${c.lift}, α ${c.alpha}, power ${c.power}, ${c.sides}-sided`, () => {
      const size = sampleSizeTwoProportions({ baselineRate: c.baseline, minimumLift: c.lift, significanceLevel: c.alpha, power: c.power, sides: c.sides as 1 | 2 });
      expect(closeRelative(size.exact.treatment, c.n, 1e-9)).toBe(true);
      expect(size.exact.holdout).toBe(size.exact.treatment);
      if (!nearInteger(c.n)) expect(size.treatment).toBe(Math.ceil(c.n));
      expect(size.total).toBe(2 * size.treatment);
    });
  }
  // statsmodels 0.13.5: samplesize_proportions_2indep_onetail(diff, prop2, power, ratio = h/(1−h), alpha, alternative)
  // -> nobs1 (treatment); holdout = nobs1·ratio (tests/reference/plan-sample-size.py)
  for (const c of statsmodels.proportions) {
    it(`matches statsmodels for a holdout share of ${c.holdoutShare} (baseline ${c.baseline}, lift ${c.lift}, ${c.sides}-sided)`, () => {
      const size = sampleSizeTwoProportions({
        baselineRate: c.baseline, minimumLift: c.lift, significanceLevel: c.alpha, power: c.power, sides: c.sides as 1 | 2, holdoutShare: c.holdoutShare,
      });
      expect(closeRelative(size.exact.treatment, c.treatment, 1e-12)).toBe(true);
      expect(closeRelative(size.exact.holdout, c.holdout, 1e-12)).toBe(true);
      expect(size.treatment).toBe(Math.ceil(c.treatment));
      expect(size.holdout).toBe(Math.ceil(c.holdout));
    });
  }
  it("needs more units for a smaller lift (monotone)", () => {
    const sizes = [0.25, 0.1, 0.05].map((lift) => sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: lift }).total);
    expect(sizes[0]).toBeLessThan(sizes[1]);
    expect(sizes[1]).toBeLessThan(sizes[2]);
  });
  it("throws a RangeError for each guard", () => {
    expect(() => sampleSizeTwoProportions({ baselineRate: 0, minimumLift: 0.1 })).toThrow(/sampleSizeTwoProportions requires baselineRate in \(0, 1\)/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.5, minimumLift: 1 })).toThrow(/sampleSizeTwoProportions requires a non-zero minimumLift/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.5, minimumLift: 0 })).toThrow(/non-zero minimumLift/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.5, minimumLift: NaN })).toThrow(/minimumLift to be a finite number/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: 0.1, power: 1 })).toThrow(/power in \(0, 1\)/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: 0.1, significanceLevel: 0 })).toThrow(/significanceLevel in \(0, 1\)/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: 0.1, sides: 0 as 1 })).toThrow(/sides 1 or 2/);
    expect(() => sampleSizeTwoProportions({ baselineRate: 0.1, minimumLift: 0.1, holdoutShare: 1 })).toThrow(/holdoutShare in \(0, 1\)/);
  });
});

describe("sampleSizeTwoMeans", () => {
  // statsmodels 0.13.5: NormalIndPower().solve_power(effect_size = mean·lift/sd, alpha, power, ratio, alternative) -> nobs1.
  // statsmodels keeps the far tail of a two-sided test (a root finder, too): 1e-5 relative for two-sided, 1e-8 one-sided.
  for (const c of statsmodels.means) {
    it(`matches NormalIndPower for mean ${c.mean}, lift ${c.lift}, sd ${c.sd}, share ${c.holdoutShare}, ${c.sides}-sided`, () => {
      const size = sampleSizeTwoMeans({
        baselineMean: c.mean, minimumLift: c.lift, standardDeviation: c.sd, significanceLevel: c.alpha, power: c.power, sides: c.sides as 1 | 2, holdoutShare: c.holdoutShare,
      });
      const tolerance = c.sides === 2 ? 1e-5 : 1e-8;
      expect(closeRelative(size.exact.treatment, c.treatment, tolerance)).toBe(true);
      expect(closeRelative(size.exact.holdout, c.holdout, tolerance)).toBe(true);
    });
  }
  it("throws a RangeError for each guard", () => {
    expect(() => sampleSizeTwoMeans({ baselineMean: 10, minimumLift: 0.1, standardDeviation: 0 })).toThrow(/sampleSizeTwoMeans requires standardDeviation > 0/);
    expect(() => sampleSizeTwoMeans({ baselineMean: 0, minimumLift: 0.1, standardDeviation: 1 })).toThrow(/non-zero baselineMean·minimumLift/);
    expect(() => sampleSizeTwoMeans({ baselineMean: Infinity, minimumLift: 0.1, standardDeviation: 1 })).toThrow(/baselineMean to be a finite number/);
  });
});

describe("durationDays, widthOptimalTau, tauFromPlan", () => {
  it("rounds the duration up", () => {
    expect(durationDays(29502, 2000)).toBe(15);
    expect(durationDays(30000, 2000)).toBe(15);
    expect(durationDays(0, 10)).toBe(0);
    expect(() => durationDays(-1, 10)).toThrow(/durationDays requires totalUnits ≥ 0/);
    expect(() => durationDays(10, 0)).toThrow(/durationDays requires dailyUnits > 0/);
  });
  it("follows τ² = V*·(2 log(1/α) + log(1 + 2 log(1/α))) (DESIGN.md §3; Howard et al. 2021)", () => {
    const twiceLog = 2 * Math.log(20);
    expect(closeRelative(widthOptimalTau(1e-4, 0.05) ** 2, 1e-4 * (twiceLog + Math.log(1 + twiceLog)), 1e-14)).toBe(true);
    expect(() => widthOptimalTau(0, 0.05)).toThrow(/widthOptimalTau requires horizonVariance > 0/);
    expect(() => widthOptimalTau(1, 1)).toThrow(/widthOptimalTau requires significanceLevel/);
  });
  it("derives τ from the variance of the lift at the planned horizon under the baseline", () => {
    const plan = tauFromPlan({ metric: "conversion", baselineRate: 0.1, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2 });
    expect(plan.sampleSize.treatment).toBe(14751);
    expect(closeRelative(plan.horizonVariance, (0.09 * 2) / 14751, 1e-14)).toBe(true);
    expect(plan.tau).toBe(widthOptimalTau(plan.horizonVariance, 0.05));
    const mean = tauFromPlan({ metric: "mean", baselineRate: 10, minimumLift: 0.05, standardDeviation: 20, significanceLevel: 0.05, power: 0.8, sides: 2 });
    expect(closeRelative(mean.horizonVariance, (400 * 2) / mean.sampleSize.treatment, 1e-14)).toBe(true);
    expect(() => tauFromPlan({ metric: "mean", baselineRate: 10, minimumLift: 0.05, significanceLevel: 0.05, power: 0.8, sides: 2 })).toThrow(
      /tauFromPlan requires standardDeviation/,
    );
  });
  it("makes the confidence sequence nearly tightest at the horizon it was tuned for", async () => {
    const { confidenceSequenceHalfWidth } = await import("@/lib/sequential");
    const variance = 1e-5;
    const tuned = widthOptimalTau(variance, 0.05);
    const width = (tau: number) => confidenceSequenceHalfWidth(variance, tau, 0.05);
    for (const factor of [0.25, 0.5, 2, 4]) expect(width(tuned)).toBeLessThan(width(tuned * factor));
  });
});
