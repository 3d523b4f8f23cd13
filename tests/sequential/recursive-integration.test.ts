import { describe, expect, it } from "vitest";
import { equalFractions } from "@/lib/sequential/equal-fractions";
import { solveDecreasing } from "@/lib/sequential/group-sequential-root";
import { normalCdf, normalDensity } from "@/lib/sequential/normal-distribution";
import { continuationDensity } from "@/lib/sequential/recursive-integration";
import { crossingProbabilities } from "@/lib/sequential/recursive-integration-crossing";
import { exitMass, exitProbability } from "@/lib/sequential/recursive-integration-exit";
import { integrationGrid } from "@/lib/sequential/recursive-integration-grid";
import { lookResolution } from "@/lib/sequential/recursive-integration-resolution";

const sum = (values: Float64Array) => values.reduce((total, value) => total + value, 0);

describe("integrationGrid", () => {
  it("has Simpson weights summing to the width of a finite region and is symmetric for a symmetric one", () => {
    const grid = integrationGrid(-1.96, 1.96, 16);
    expect(sum(grid.weights)).toBeCloseTo(3.92, 12);
    expect(grid.points.length % 2).toBe(1);
    for (let j = 0; j < grid.points.length; j += 1) {
      expect(grid.points[j]).toBeCloseTo(-grid.points[grid.points.length - 1 - j], 12);
      expect(grid.weights[j]).toBeCloseTo(grid.weights[grid.points.length - 1 - j], 12);
    }
  });
  it("integrates the normal density over a one-sided region to Φ(upper) (one Simpson pass, 1e-6)", () => {
    const grid = integrationGrid(-Infinity, 2.3, 16);
    const total = grid.points.reduce((acc, x, j) => acc + grid.weights[j] * Math.exp(-x * x / 2) / Math.sqrt(2 * Math.PI), 0);
    expect(Math.abs(total - normalCdf(2.3))).toBeLessThan(1e-6);
  });
  it("keeps a region narrower than one grid step", () => {
    expect(integrationGrid(0.01, 0.02, 2).points.length).toBe(3);
  });
  it("throws on each guard", () => {
    expect(() => integrationGrid(1, 1, 16)).toThrow("integrationGrid requires lower < upper");
    expect(() => integrationGrid(Number.NaN, 1, 16)).toThrow("integrationGrid requires lower < upper");
    expect(() => integrationGrid(-1, 1, 1)).toThrow("integrationGrid requires an integer resolution ≥ 2");
    expect(() => integrationGrid(-1, 1, 16, Number.NaN)).toThrow("integrationGrid requires a finite center");
  });
});

describe("continuationDensity and exitProbability", () => {
  it("conserve probability: continuing mass + exits at the next look = continuing mass before", () => {
    // Under no effect the mass that continues past look k plus what exits at look k+1 equals the
    // continuing mass at look k (a check of the recursion itself, not an outside reference).
    const first = continuationDensity(undefined, 0.5, -2, 2, 20);
    expect(sum(first.weightedDensity)).toBeCloseTo(normalCdf(2) - normalCdf(-2), 7);
    const up = exitProbability(first, 1, 2.1, "upper").probability;
    const down = exitProbability(first, 1, -2.1, "lower").probability;
    const second = continuationDensity(first, 1, -2.1, 2.1, 20);
    expect(sum(second.weightedDensity) + up + down).toBeCloseTo(sum(first.weightedDensity), 8);
    expect(up).toBeCloseTo(down, 14);
  });
  it("gives the normal tail and density at the first look", () => {
    const exit = exitProbability(undefined, 0.3, 1.959963984540054, "upper");
    expect(exit.probability).toBeCloseTo(0.025, 14);
    expect(exit.densityAtBound).toBeCloseTo(normalDensity(1.959963984540054), 14);
  });
  it("throws on each guard", () => {
    const first = continuationDensity(undefined, 0.5, -2, 2, 8);
    expect(() => continuationDensity(undefined, 0, -2, 2, 8)).toThrow("continuationDensity requires a finite fraction > 0");
    expect(() => continuationDensity(first, 0.5, -2, 2, 8)).toThrow("continuationDensity requires a fraction above the previous look's 0.5");
    expect(() => exitProbability(first, 1, Number.NaN, "upper")).toThrow("exitProbability requires a bound, got NaN");
    expect(() => exitProbability(undefined, Infinity, 1, "upper")).toThrow("exitProbability requires a finite fraction > 0");
    expect(() => exitProbability(first, 0.4, 1, "upper")).toThrow("exitProbability requires a fraction above the previous look's 0.5");
  });
});

describe("exitMass", () => {
  it("equals exitProbability's probability on either side, at the first look and beyond", () => {
    const first = continuationDensity(undefined, 0.2, -2.2, 1.9, 20);
    const second = continuationDensity(first, 0.45, -2.2, 1.9, 20);
    for (const [previous, fraction] of [[undefined, 0.2], [first, 0.45], [second, 0.46], [second, 1]] as const) {
      for (const bound of [-Infinity, -2.3, -0.5, 0, 1.7, 2.4, Infinity]) {
        for (const side of ["upper", "lower"] as const) {
          expect(exitMass(previous, fraction, bound, side)).toBeCloseTo(exitProbability(previous, fraction, bound, side).probability, 15);
        }
      }
    }
    expect(exitMass(second, 1, 2.4, "upper")).toBeGreaterThan(0);
  });
  it("throws on each guard", () => {
    const first = continuationDensity(undefined, 0.5, -2, 2, 8);
    expect(() => exitMass(first, 1, Number.NaN, "upper")).toThrow("exitMass requires a bound, got NaN");
    expect(() => exitMass(undefined, Infinity, 1, "upper")).toThrow("exitMass requires a finite fraction > 0");
    expect(() => exitMass(first, 0.4, 1, "upper")).toThrow("exitMass requires a fraction above the previous look's 0.5");
  });
});

describe("continuationDensity into given storage", () => {
  it("gives the same density as fresh storage, in a view of the storage", () => {
    const first = continuationDensity(undefined, 0.3, -2, 2, 16);
    const fresh = continuationDensity(first, 0.6, -2.1, 1.8, 16);
    const storage = new Float64Array(1000).fill(7);
    const reused = continuationDensity(first, 0.6, -2.1, 1.8, 16, storage);
    expect(Array.from(reused.weightedDensity)).toEqual(Array.from(fresh.weightedDensity));
    expect(reused.weightedDensity.buffer).toBe(storage.buffer);
    expect(storage[reused.weightedDensity.length]).toBe(7);
  });
  it("refuses storage too short or shared with the previous look", () => {
    const storage = new Float64Array(1000);
    const first = continuationDensity(undefined, 0.3, -2, 2, 16, storage);
    expect(() => continuationDensity(first, 0.6, -2, 2, 16, storage.subarray(500))).toThrow("continuationDensity requires storage of");
    expect(() => continuationDensity(first, 0.6, -2, 2, 16, new Float64Array(10))).toThrow("continuationDensity requires storage of");
  });
});

describe("crossingProbabilities", () => {
  it("splits a symmetric design equally between its two boundaries", () => {
    const fractions = equalFractions(6);
    const result = crossingProbabilities(fractions, fractions.map(() => 2.2), "symmetric");
    result.total.forEach((value, k) => {
      expect(result.upper[k]).toBeCloseTo(result.lower[k], 14);
      expect(value).toBeCloseTo(result.upper[k] + result.lower[k], 14);
    });
  });
  it("an asymmetric design equals the symmetric one when its bounds are mirrored", () => {
    const fractions = [0.2, 0.5, 1];
    const symmetric = crossingProbabilities(fractions, [2.5, 2.2, 2], "symmetric").total;
    const explicit = crossingProbabilities(fractions, [2.5, 2.2, 2], [-2.5, -2.2, -2]).total;
    explicit.forEach((value, k) => expect(value).toBeCloseTo(symmetric[k], 10));
  });
  it("throws on each guard", () => {
    expect(() => crossingProbabilities([], [], "symmetric")).toThrow("crossingProbabilities requires at least one look");
    expect(() => crossingProbabilities([1], [1, 2], "symmetric")).toThrow("crossingProbabilities requires one upper and one lower bound per look");
    expect(() => crossingProbabilities([1], [2], "symmetric", 1)).toThrow("crossingProbabilities requires an integer resolution ≥ 2");
    expect(() => crossingProbabilities([0.5, 0.5], [2, 2], "symmetric")).toThrow("crossingProbabilities requires strictly increasing finite fractions > 0");
    expect(() => crossingProbabilities([1], [-2], "symmetric")).toThrow("crossingProbabilities requires lower < upper at look 1");
    expect(() => crossingProbabilities([1], [Number.NaN], [-1])).toThrow("crossingProbabilities requires lower < upper at look 1");
  });
});

describe("lookResolution", () => {
  it("keeps r for well separated looks and refines, capped, for close ones", () => {
    expect(lookResolution(16, [0.5, 1], 0)).toBe(16);
    expect(lookResolution(16, [0.5, 0.995, 1], 1)).toBe(23);
    expect(lookResolution(16, [0.5, 0.5 + 1e-12, 1], 0)).toBe(1000);
  });
  it("throws on each guard", () => {
    expect(() => lookResolution(16, [1], 1)).toThrow("lookResolution requires a look index in [0, 0]");
    expect(() => lookResolution(1.5, [1], 0)).toThrow("lookResolution requires an integer resolution ≥ 2");
  });
});

describe("solveDecreasing", () => {
  it("finds √2 and returns an end when the sign does not change", () => {
    expect(solveDecreasing((x) => 2 - x * x, 0, 2)).toBeCloseTo(Math.SQRT2, 10);
    expect(solveDecreasing((x) => -1 - x, 0, 1)).toBe(0);
    expect(solveDecreasing((x) => 5 - x, 0, 1)).toBe(1);
  });
  it("throws on each guard", () => {
    expect(() => solveDecreasing((x) => x, 1, 0)).toThrow("solveDecreasing requires a finite bracket low < high");
    expect(() => solveDecreasing((x) => x, 0, 1, 0)).toThrow("solveDecreasing requires a tolerance > 0");
  });
});
