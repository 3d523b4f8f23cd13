import { describe, expect, it } from "vitest";
import { obrienFlemingConstant } from "@/lib/sequential/obrien-fleming-constant";
import { pocockConstant } from "@/lib/sequential/pocock-constant";
import rpact from "../reference/fixtures/rpact-spending-boundaries.json";
import { TOLERANCE } from "./tolerance";

describe("pocockConstant against R's rpact", () => {
  // tests/reference/rpact-spending-boundaries.R, rpact 3.3.4: getDesignGroupSequential(typeOfDesign = "P")$criticalValues
  for (const reference of rpact.constant.filter((entry) => entry.typeOfDesign === "P")) {
    it(reference.call, () => {
      const value = pocockConstant(reference.looks, reference.alpha, reference.sided as 1 | 2);
      for (const critical of reference.criticalValues) expect(Math.abs(value - (critical as number))).toBeLessThanOrEqual(TOLERANCE.boundary);
    });
  }
});

describe("pocockConstant against the published table", () => {
  // Jennison & Turnbull (2000), Table 2.1, C_P(K, α = 0.05), two-sided; typed in from memory to 3
  // decimals, and each agrees with rpact above to 3 decimals: |difference| ≤ 5e-4.
  const table: [number, number][] = [[1, 1.96], [2, 2.178], [3, 2.289], [4, 2.361], [5, 2.413]];
  for (const [looks, published] of table) {
    it(`K = ${looks}: ${published}`, () => expect(Math.abs(pocockConstant(looks, 0.05) - published)).toBeLessThanOrEqual(5e-4));
  }
});

describe("pocockConstant properties", () => {
  it("lies between the single-look value and the Bonferroni bound and grows with K", () => {
    let before = 1.959963984540054;
    for (let looks = 2; looks <= 8; looks += 1) {
      const value = pocockConstant(looks, 0.05);
      expect(value).toBeGreaterThan(before);
      expect(value).toBeLessThan(obrienFlemingConstant(looks, 0.05) * Math.sqrt(looks));
      before = value;
    }
  });
});

describe("pocockConstant guards", () => {
  it("rejects looks that are not an integer ≥ 1", () => {
    for (const looks of [0, 2.5, Number.NaN]) expect(() => pocockConstant(looks, 0.05)).toThrow("pocockConstant requires an integer number of looks ≥ 1");
  });
  it("rejects α outside (0, 1)", () => {
    for (const alpha of [0, 1, Number.NaN]) expect(() => pocockConstant(3, alpha)).toThrow("pocockConstant requires a significanceLevel in (0, 1)");
  });
  it("rejects sides other than 1 or 2", () => {
    expect(() => pocockConstant(3, 0.05, 3 as 1)).toThrow(new RangeError("pocockConstant requires sides 1 or 2, got 3"));
  });
});
