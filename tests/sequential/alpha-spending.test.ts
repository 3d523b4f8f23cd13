import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { hwangShihDeCaniSpending, obrienFlemingSpending, pocockSpending } from "@/lib/sequential/alpha-spending";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";

describe("alpha-spending functions against R's rpact", () => {
  // tests/reference/rpact-spending-boundaries.R, rpact 3.3.4: getDesignGroupSequential(...)$alphaSpent.
  for (const reference of rpact.spending) {
    it(reference.call, () => {
      reference.informationRates.forEach((t, k) => {
        const spent =
          reference.typeOfDesign === "asOF"
            ? obrienFlemingSpending(t, reference.alpha, reference.sided as 1 | 2)
            : reference.typeOfDesign === "asP"
              ? pocockSpending(t, reference.alpha)
              : hwangShihDeCaniSpending(t, reference.alpha, reference.gamma as number);
        // rpact's last alphaSpent is 4.999999e-02 for 0.05 (its search tolerance) and it computes
        // 1 − pnorm(x) (absolute rounding ~1e-16): agreement to 1e-6 of α
        expect(Math.abs(spent - reference.alphaSpent[k])).toBeLessThanOrEqual(1e-6 * reference.alpha);
      });
    });
  }
});

describe("alpha-spending function properties", () => {
  const alpha = fc.double({ min: 1e-6, max: 0.999, noNaN: true });
  const fraction = fc.double({ min: 0, max: 1, noNaN: true });
  const gamma = fc.double({ min: -40, max: 40, noNaN: true }).filter((value) => Math.abs(value) > 1e-6);
  const all = (t: number, a: number, g: number) => [
    obrienFlemingSpending(t, a, 1), obrienFlemingSpending(t, a, 2), pocockSpending(t, a), hwangShihDeCaniSpending(t, a, g),
  ];

  it("each equals α at t = 1 and 0 at t = 0", () => {
    fc.assert(fc.property(alpha, gamma, (a, g) => {
      for (const value of all(1, a, g)) expect(value).toBe(a);
      for (const value of all(0, a, g)) expect(value).toBe(0);
    }));
  });

  it("each is non-decreasing in t and stays in [0, α]", () => {
    fc.assert(fc.property(alpha, gamma, fraction, fraction, (a, g, s, t) => {
      const [early, late] = s < t ? [s, t] : [t, s];
      const before = all(early, a, g);
      all(late, a, g).forEach((value, index) => {
        expect(value).toBeGreaterThanOrEqual(before[index]);
        expect(value).toBeLessThanOrEqual(a);
        expect(before[index]).toBeGreaterThanOrEqual(0);
      });
    }));
  });

  it("Hwang–Shih–DeCani does not overflow for steep γ", () => {
    expect(hwangShihDeCaniSpending(0.5, 0.05, -1000)).toBeLessThan(1e-200);
    expect(hwangShihDeCaniSpending(0.5, 0.05, 1000)).toBeCloseTo(0.05, 15);
    expect(hwangShihDeCaniSpending(0.9, 0.05, -30)).toBeCloseTo(0.05 * Math.exp(-3), 10);
  });

  it("the two-sided O'Brien–Fleming type is the one-sided function at α/2 on each side", () => {
    fc.assert(fc.property(alpha, fraction, (a, t) => {
      expect(obrienFlemingSpending(t, a, 2)).toBeCloseTo(2 * obrienFlemingSpending(t, a / 2, 1), 14);
    }));
  });
});

describe("alpha-spending function guards", () => {
  const cases: [string, (t: number, a: number) => number][] = [
    ["obrienFlemingSpending", (t, a) => obrienFlemingSpending(t, a, 2)],
    ["pocockSpending", pocockSpending],
    ["hwangShihDeCaniSpending", (t, a) => hwangShihDeCaniSpending(t, a, -4)],
  ];
  for (const [name, fn] of cases) {
    it(`${name} rejects t outside [0, 1]`, () => {
      for (const t of [-0.1, 1.1, Number.NaN]) expect(() => fn(t, 0.05)).toThrow(`${name} requires an information fraction in [0, 1]`);
    });
    it(`${name} rejects α outside (0, 1)`, () => {
      for (const a of [0, 1, Number.NaN]) expect(() => fn(0.5, a)).toThrow(new RangeError(`${name} requires a significanceLevel in (0, 1), got ${a}`));
    });
  }
  it("obrienFlemingSpending rejects sides other than 1 or 2", () => {
    expect(() => obrienFlemingSpending(0.5, 0.05, 3 as 1)).toThrow("obrienFlemingSpending requires sides 1 or 2");
  });
  it("hwangShihDeCaniSpending rejects γ = 0 or not finite", () => {
    for (const g of [0, Number.NaN, Infinity]) expect(() => hwangShihDeCaniSpending(0.5, 0.05, g)).toThrow("hwangShihDeCaniSpending requires a finite non-zero gamma");
  });
});
