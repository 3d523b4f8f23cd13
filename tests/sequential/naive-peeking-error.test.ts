import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { equalFractions } from "@/lib/sequential/equal-fractions";
import { naivePeekingError, naivePeekingErrorByLook } from "@/lib/sequential/naive-peeking-error";
import { crossingProbabilities } from "@/lib/sequential/recursive-integration-crossing";
import mvtnorm from "../reference/fixtures/mvtnorm-naive-peeking.json";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";
import { TOLERANCE } from "./tolerance";

const freeze = (values: number[]): readonly number[] => Object.freeze([...values]);

describe("naivePeekingError against R's mvtnorm", () => {
  // tests/reference/mvtnorm-naive-peeking.R, mvtnorm 1.1-3 on R 4.2.2: each case records its call,
  // 1 - pmvnorm(lower, upper, sigma = sqrt(t_i/t_j), algorithm = Miwa(steps = 512) for K ≤ 8,
  // GenzBretz(maxpts = 2e7, abseps = 1e-6) beyond, seed 20240601). Genz–Bretz reports its own
  // integration error (up to 4.7e-5 at 50–100 looks), added to the tolerance.
  for (const reference of mvtnorm.cases) {
    const looks = reference.informationRates.length;
    it(`${looks} looks, α = ${reference.alpha}, ${reference.sided}-sided: ${reference.call}`, () => {
      const value = naivePeekingError(freeze(reference.informationRates), {
        significanceLevel: reference.alpha,
        sides: reference.sided as 1 | 2,
      });
      const allowed = TOLERANCE.peeking + 3 * (reference.integrationError ?? 0);
      expect(Math.abs(value - reference.error)).toBeLessThanOrEqual(allowed);
    });
  }
});

describe("naivePeekingErrorByLook against R's rpact", () => {
  // tests/reference/rpact-spending-boundaries.R, rpact 3.3.4 on R 4.2.2: cumulative crossing of the
  // constant boundary ±qnorm(1 − α/2) (or qnorm(1 − α) one-sided) by getGroupSequentialProbabilities.
  for (const reference of rpact.peeking) {
    const looks = reference.informationRates.length;
    it(`${looks} looks, α = ${reference.alpha}, ${reference.sided}-sided: ${reference.call}`, () => {
      const byLook = naivePeekingErrorByLook(freeze(reference.informationRates), {
        significanceLevel: reference.alpha,
        sides: reference.sided as 1 | 2,
      });
      expect(byLook).toHaveLength(looks);
      byLook.forEach((value, k) => expect(Math.abs(value - reference.errorByLook[k])).toBeLessThanOrEqual(TOLERANCE.peeking));
    });
  }
});

describe("naivePeekingError against the published table", () => {
  // Armitage, McPherson & Rowe (1969), JRSS A 132, Table 2; as Jennison & Turnbull (2000) Table 1.1:
  // the error of repeated two-sided tests at nominal 0.05 with K equally spaced looks.
  // Typed in from memory to 3 decimals (not read off the book here); every K ≤ 100 also agrees with
  // R above (rpact/mvtnorm), so the check is rounding-limited: |difference| ≤ 5e-4.
  const table: [number, number][] = [
    [1, 0.05], [2, 0.083], [3, 0.107], [4, 0.126], [5, 0.142],
    [10, 0.193], [20, 0.248], [50, 0.320], [100, 0.374], [1000, 0.530],
  ];
  for (const [looks, published] of table) {
    it(`K = ${looks}: ${published}`, () => {
      expect(Math.abs(naivePeekingError(equalFractions(looks)) - published)).toBeLessThanOrEqual(5e-4);
    });
  }
});

describe("naivePeekingError accuracy by grid refinement", () => {
  // Our own convergence check, not an outside reference: the default grid (r = 20, Richardson
  // from r and 2r) against r = 48, whose own error is below 1e-10 at these looks.
  for (const looks of [20, 100]) {
    it(`${looks} equally spaced looks agree with a 2.4× finer grid to 1e-7`, () => {
      const fractions = equalFractions(looks);
      const critical = fractions.map(() => 1.959963984540054);
      const fine = crossingProbabilities(fractions, critical, "symmetric", 48).total[looks - 1];
      expect(Math.abs(naivePeekingError(fractions) - fine)).toBeLessThan(1e-7);
    });
  }
});

describe("naivePeekingError properties", () => {
  it("equals α at one look, for any α and sides", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-4, max: 0.5, noNaN: true }), fc.constantFrom<1 | 2>(1, 2), (alpha, sides) => {
        expect(naivePeekingError([1], { significanceLevel: alpha, sides })).toBeCloseTo(alpha, 12);
        expect(naivePeekingError([0.3], { significanceLevel: alpha, sides })).toBeCloseTo(alpha, 12);
      }),
      { numRuns: 30 },
    );
  });

  it("grows with the number of equally spaced looks", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 30 }), fc.constantFrom<1 | 2>(1, 2), (looks, sides) => {
        const fewer = naivePeekingError(equalFractions(looks), { sides });
        const more = naivePeekingError(equalFractions(looks + 1), { sides });
        expect(more).toBeGreaterThan(fewer);
      }),
      { numRuns: 25 },
    );
  });

  it("by look is non-decreasing, starts at α, stays in [α, 1] and ends at naivePeekingError", () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 1000 }), { minLength: 1, maxLength: 15 }),
        fc.double({ min: 0.001, max: 0.3, noNaN: true }),
        (raw, alpha) => {
          const fractions = freeze(raw.map((value) => value / 1000).sort((a, b) => a - b));
          const byLook = naivePeekingErrorByLook(fractions, { significanceLevel: alpha });
          expect(byLook[0]).toBe(alpha);
          for (let k = 1; k < byLook.length; k += 1) expect(byLook[k]).toBeGreaterThanOrEqual(byLook[k - 1]);
          for (const value of byLook) expect(value).toBeLessThanOrEqual(1);
          expect(naivePeekingError(fractions, { significanceLevel: alpha })).toBe(byLook[byLook.length - 1]);
        },
      ),
      { numRuns: 25 },
    );
  });

  it("adding a look to any schedule never lowers the error", () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 1, max: 99 }), { minLength: 1, maxLength: 10 }),
        fc.integer({ min: 1, max: 99 }),
        (raw, extraPercent) => {
          const base = [...raw.map((value) => value / 100), 1].sort((a, b) => a - b);
          const extra = extraPercent / 100 - 0.005;
          const more = [...base, extra].sort((a, b) => a - b);
          expect(naivePeekingError(more)).toBeGreaterThanOrEqual(naivePeekingError(base) - 1e-9);
        },
      ),
      { numRuns: 20 },
    );
  });
});

describe("naivePeekingErrorByLook remembered curves", () => {
  it("answers repeated inputs with the same values, in a fresh array each time", () => {
    const fractions = freeze(equalFractions(37));
    const first = naivePeekingErrorByLook(fractions, { significanceLevel: 0.04 });
    first[5] = 99;
    const second = naivePeekingErrorByLook(fractions, { significanceLevel: 0.04 });
    expect(second[5]).not.toBe(99);
    const critical = fractions.map(() => 2.053748910631823);
    const direct = crossingProbabilities(fractions, critical, "symmetric").total;
    second.slice(1).forEach((value, k) => expect(value).toBeCloseTo(direct[k + 1], 12));
  });
  it("keeps the level and the sides apart", () => {
    const fractions = freeze(equalFractions(12));
    const twoSided = naivePeekingErrorByLook(fractions, { significanceLevel: 0.05 });
    const oneSided = naivePeekingErrorByLook(fractions, { significanceLevel: 0.05, sides: 1 });
    const other = naivePeekingErrorByLook(fractions, { significanceLevel: 0.1 });
    expect(oneSided[11]).not.toBeCloseTo(twoSided[11], 3);
    expect(other[11]).toBeGreaterThan(twoSided[11] + 0.05);
    expect(naivePeekingErrorByLook(fractions, { significanceLevel: 0.05, sides: 1 })).toEqual(oneSided);
  });
});

describe("naivePeekingError guards", () => {
  for (const fn of [naivePeekingError, naivePeekingErrorByLook]) {
    it(`${fn.name} rejects an empty schedule`, () => {
      expect(() => fn([])).toThrow(new RangeError(`${fn.name} requires at least one information fraction`));
    });
    it(`${fn.name} rejects a non-increasing schedule`, () => {
      expect(() => fn([0.5, 0.5, 1])).toThrow(RangeError);
      expect(() => fn([0.5, 0.5, 1])).toThrow(`${fn.name} requires strictly increasing information fractions in (0, 1]`);
    });
    it(`${fn.name} rejects fractions outside (0, 1]`, () => {
      expect(() => fn([0, 1])).toThrow(`${fn.name} requires strictly increasing`);
      expect(() => fn([0.5, 1.2])).toThrow(`${fn.name} requires strictly increasing`);
      expect(() => fn([0.5, Number.NaN])).toThrow(`${fn.name} requires strictly increasing`);
    });
    it(`${fn.name} rejects α outside (0, 1)`, () => {
      for (const significanceLevel of [0, 1, -0.1, Number.NaN]) {
        expect(() => fn([1], { significanceLevel })).toThrow(`${fn.name} requires a significanceLevel in (0, 1)`);
      }
    });
    it(`${fn.name} rejects sides other than 1 or 2`, () => {
      expect(() => fn([1], { sides: 3 as 1 })).toThrow(`${fn.name} requires sides 1 or 2`);
    });
  }
});
