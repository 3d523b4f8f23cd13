import fc from "fast-check";
import { describe, expect, it } from "vitest";
import integration from "../reference/fixtures/msprt-integration.json";
import { alwaysValidSequence, bonferroniLevel, confidenceSequenceHalfWidth, msprtLogLikelihoodRatio, type SequenceLook } from "@/lib/sequential";
import { closeRelative } from "./tolerance";

describe("msprtLogLikelihoodRatio", () => {
  // The closed form against numerical integration over the N(0, τ²) mixing distribution:
  // scipy 1.10.1 integrate.quad of φ((Δ−θ)/√V)/φ(Δ/√V)·N(θ; 0, τ²) dθ (Robbins 1970; Johari et al. 2022).
  // Script: tests/reference/msprt-integration.py
  for (const c of integration.likelihoodRatios) {
    it(`equals the integral for Δ = ${c.estimate}, V = ${c.variance}, τ = ${c.tau}`, () => {
      expect(closeRelative(Math.exp(msprtLogLikelihoodRatio(c.estimate, c.variance, c.tau)), c.likelihoodRatio, 1e-9)).toBe(true);
    });
  }
  it("throws a RangeError for each guard", () => {
    expect(() => msprtLogLikelihoodRatio(NaN, 1, 1)).toThrow(/msprtLogLikelihoodRatio requires estimate to be a finite number/);
    expect(() => msprtLogLikelihoodRatio(0, 0, 1)).toThrow(/msprtLogLikelihoodRatio requires variance > 0/);
    expect(() => msprtLogLikelihoodRatio(0, 1, 0)).toThrow(/msprtLogLikelihoodRatio requires tau > 0/);
  });
});

describe("confidenceSequenceHalfWidth", () => {
  // The bounds where the integrated mixture ratio of (Δ − θ0) equals 1/α, found by scipy.optimize.brentq
  // on the scipy.integrate.quad integral (tests/reference/msprt-integration.py).
  for (const c of integration.confidenceSequences) {
    it(`matches the inverted integral for Δ = ${c.estimate}, V = ${c.variance}, τ = ${c.tau}, α = ${c.alpha}`, () => {
      const half = confidenceSequenceHalfWidth(c.variance, c.tau, c.alpha);
      expect(closeRelative(c.estimate + half, c.upper, 1e-9)).toBe(true);
      expect(Math.abs(c.estimate - half - c.lower)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(c.lower), half));
    });
  }
  it("excludes 0 exactly when 1/Λ ≤ α", () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 1e-6, max: 1, noNaN: true }), fc.double({ min: 1e-3, max: 2, noNaN: true }), (estimate, variance, tau) => {
        const excludes = Math.abs(estimate) > confidenceSequenceHalfWidth(variance, tau, 0.05);
        const logRatio = msprtLogLikelihoodRatio(estimate, variance, tau);
        if (Math.abs(logRatio - Math.log(20)) > 1e-9) expect(excludes).toBe(logRatio > Math.log(20));
      }),
    );
  });
  it("throws a RangeError for each guard", () => {
    expect(() => confidenceSequenceHalfWidth(0, 1, 0.05)).toThrow(/confidenceSequenceHalfWidth requires variance > 0/);
    expect(() => confidenceSequenceHalfWidth(1, -1, 0.05)).toThrow(/confidenceSequenceHalfWidth requires tau > 0/);
    expect(() => confidenceSequenceHalfWidth(1, 1, 0)).toThrow(/confidenceSequenceHalfWidth requires significanceLevel/);
  });
});

describe("alwaysValidSequence", () => {
  const lookArbitrary = fc.option(
    fc.record({ estimate: fc.double({ min: -0.2, max: 0.2, noNaN: true }), variance: fc.double({ min: 1e-7, max: 1e-2, noNaN: true }) }),
    { nil: null, freq: 5 },
  );
  it("never raises the p-value and never widens the confidence sequence (properties)", () => {
    fc.assert(
      fc.property(fc.array(lookArbitrary, { minLength: 1, maxLength: 60 }), fc.double({ min: 1e-4, max: 0.5, noNaN: true }), (looks, tau) => {
        const steps = alwaysValidSequence(Object.freeze(looks) as SequenceLook[], { tau, significanceLevel: 0.05 });
        for (let i = 0; i < steps.length; i++) {
          expect(steps[i].p >= 0 && steps[i].p <= 1).toBe(true);
          if (i > 0) {
            expect(steps[i].p).toBeLessThanOrEqual(steps[i - 1].p);
            expect(steps[i].cs[0]).toBeGreaterThanOrEqual(steps[i - 1].cs[0]);
            expect(steps[i].cs[1]).toBeLessThanOrEqual(steps[i - 1].cs[1]);
          }
        }
      }),
    );
  });
  it("uses the closed forms at each look (running minimum and intersection)", () => {
    const looks = Object.freeze([null, { estimate: 0.01, variance: 1e-4 }, { estimate: 0.03, variance: 5e-5 }, { estimate: 0.005, variance: 2e-5 }]);
    const steps = alwaysValidSequence(looks, { tau: 0.01, significanceLevel: 0.05 });
    expect(steps[0]).toEqual({ p: 1, cs: [-Infinity, Infinity] });
    let p = 1;
    let lower = -Infinity;
    let upper = Infinity;
    for (let i = 1; i < looks.length; i++) {
      const look = looks[i]!;
      p = Math.min(p, Math.exp(-msprtLogLikelihoodRatio(look.estimate, look.variance, 0.01)));
      const half = confidenceSequenceHalfWidth(look.variance, 0.01, 0.05);
      lower = Math.max(lower, look.estimate - half);
      upper = Math.min(upper, look.estimate + half);
      expect(closeRelative(steps[i].p, p, 1e-14)).toBe(true);
      expect(closeRelative(steps[i].cs[0], lower, 1e-14)).toBe(true);
      expect(closeRelative(steps[i].cs[1], upper, 1e-14)).toBe(true);
    }
  });
  it("throws a RangeError for each guard", () => {
    expect(() => alwaysValidSequence([], { tau: 0, significanceLevel: 0.05 })).toThrow(/alwaysValidSequence requires tau > 0/);
    expect(() => alwaysValidSequence([], { tau: 1, significanceLevel: 2 })).toThrow(/alwaysValidSequence requires significanceLevel/);
    expect(() => alwaysValidSequence([{ estimate: 0, variance: 0 }], { tau: 1, significanceLevel: 0.05 })).toThrow(/variance > 0/);
    expect(() => alwaysValidSequence([{ estimate: NaN, variance: 1 }], { tau: 1, significanceLevel: 0.05 })).toThrow(/finite estimate/);
  });
});

describe("bonferroniLevel", () => {
  it("splits α across the treatment arms", () => {
    expect(bonferroniLevel(0.05, 1)).toBe(0.05);
    expect(bonferroniLevel(0.05, 2)).toBe(0.025);
    expect(() => bonferroniLevel(0.05, 0)).toThrow(/bonferroniLevel requires comparisons to be a positive integer/);
    expect(() => bonferroniLevel(1.5, 2)).toThrow(/bonferroniLevel requires significanceLevel/);
  });
});
