import { describe, expect, it } from "vitest";
import { obrienFlemingConstant } from "@/lib/sequential/obrien-fleming-constant";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";
import { TOLERANCE } from "./tolerance";

describe("obrienFlemingConstant against R's rpact", () => {
  // tests/reference/rpact-spending-boundaries.R, rpact 3.3.4: getDesignGroupSequential(typeOfDesign = "OF")$criticalValues,
  // whose look k is C_B·√(K/k)
  for (const reference of rpact.constant.filter((entry) => entry.typeOfDesign === "OF")) {
    it(reference.call, () => {
      const value = obrienFlemingConstant(reference.looks, reference.alpha, reference.sided as 1 | 2);
      reference.criticalValues.forEach((critical, k) => {
        // rpact leaves the first of 20 one-sided looks (C_B·√20 ≈ 9.5) as NA (null in the fixture)
        if (critical === null) return;
        expect(Math.abs(value * Math.sqrt(reference.looks / (k + 1)) - critical)).toBeLessThanOrEqual(TOLERANCE.boundary);
      });
    });
  }
});

describe("obrienFlemingConstant against the published table", () => {
  // Jennison & Turnbull (2000), Table 2.3, C_B(K, α = 0.05), two-sided; typed in from memory to 3
  // decimals, and each agrees with rpact above to 3 decimals: |difference| ≤ 5e-4.
  const table: [number, number][] = [[1, 1.96], [2, 1.977], [3, 2.004], [4, 2.024], [5, 2.040]];
  for (const [looks, published] of table) {
    it(`K = ${looks}: ${published}`, () => expect(Math.abs(obrienFlemingConstant(looks, 0.05) - published)).toBeLessThanOrEqual(5e-4));
  }
});

describe("obrienFlemingConstant guards", () => {
  it("rejects looks that are not an integer ≥ 1", () => {
    for (const looks of [0, -1, 1.5]) expect(() => obrienFlemingConstant(looks, 0.05)).toThrow("obrienFlemingConstant requires an integer number of looks ≥ 1");
  });
  it("rejects α outside (0, 1)", () => {
    for (const alpha of [0, 1.5, Number.NaN]) expect(() => obrienFlemingConstant(3, alpha)).toThrow("obrienFlemingConstant requires a significanceLevel in (0, 1)");
  });
  it("rejects sides other than 1 or 2", () => {
    expect(() => obrienFlemingConstant(3, 0.05, 0 as 1)).toThrow("obrienFlemingConstant requires sides 1 or 2");
  });
});
