import { describe, expect, it } from "vitest";
import { analyzeCampaign, binomialProbability, dayNumber, equalFractions, formatDay, naivePeekingError, type CampaignPlan, type DailyCountRow } from "@/lib/sequential";
import { seededRandom } from "./seeded-random";

const DAYS = 28;
const START = dayNumber("2026-03-01")!;
const UNITS_PER_DAY = 500;
const RATE = 0.1;
const REPLICATIONS = 3000;
const plan: CampaignPlan = {
  metric: "conversion",
  significanceLevel: 0.05,
  power: 0.8,
  sides: 2,
  baselineRate: RATE,
  minimumLift: 0.1,
  arms: [
    { key: "holdout", share: 0.5 },
    { key: "treatment", share: 0.5 },
  ],
};

/** Binomial(n, p) draws by inverting the CDF with one uniform each (exact up to the table's rounding). */
function binomialSampler(trials: number, probability: number, random: () => number): () => number {
  const cdf: number[] = [];
  let total = 0;
  for (let k = 0; k <= trials; k++) cdf.push((total += binomialProbability(k, trials, probability)));
  return () => {
    const u = random() * total;
    let low = 0;
    let high = trials;
    while (low < high) {
      const middle = (low + high) >> 1;
      if (cdf[middle] < u) low = middle + 1;
      else high = middle;
    }
    return low;
  };
}

/** A/A campaigns with a look every day; the share of campaigns each test ever rejects. */
function simulateAaCampaigns(random: () => number, replications: number): { alwaysValid: number; naive: number } {
  const draw = binomialSampler(UNITS_PER_DAY, RATE, random);
  let alwaysValid = 0;
  let naive = 0;
  for (let r = 0; r < replications; r++) {
    const rows: DailyCountRow[] = [];
    for (let d = 0; d < DAYS; d++) {
      for (const arm of ["holdout", "treatment"]) {
        const x = draw();
        rows.push({ date: formatDay(START + d), arm, n: UNITS_PER_DAY, sum: x, sumSq: x });
      }
    }
    const result = analyzeCampaign(plan, rows, { peekingCost: false });
    if (result.days.some((day) => day.sequential.p < plan.significanceLevel)) alwaysValid++;
    if (result.days.some((day) => day.fixed.p !== null && day.fixed.p < plan.significanceLevel)) naive++;
  }
  return { alwaysValid: alwaysValid / replications, naive: naive / replications };
}

/**
 * Two treatment arms whose true relative lift is exactly the planned minimum (+10 %): the share of
 * campaigns in which an arm's relative sequence ever misses the true lift, and ever calls it flat.
 */
function simulateMinimumLiftCampaigns(random: () => number, replications: number): { missedByArm: number; missedAny: number; flatByArm: number } {
  const twoArms: CampaignPlan = {
    ...plan,
    arms: [
      { key: "holdout", share: 1 / 3 },
      { key: "treatment", share: 1 / 3 },
      { key: "variant-b", share: 1 / 3 },
    ],
  };
  const holdout = binomialSampler(UNITS_PER_DAY, RATE, random);
  const treated = binomialSampler(UNITS_PER_DAY, RATE * 1.1, random);
  let missedByArm = 0;
  let missedAny = 0;
  let flatByArm = 0;
  for (let r = 0; r < replications; r++) {
    const rows: DailyCountRow[] = [];
    for (let d = 0; d < DAYS; d++) {
      for (const arm of ["holdout", "treatment", "variant-b"]) {
        const x = arm === "holdout" ? holdout() : treated();
        rows.push({ date: formatDay(START + d), arm, n: UNITS_PER_DAY, sum: x, sumSq: x });
      }
    }
    const result = analyzeCampaign({ ...twoArms, maxDays: DAYS + 1 }, rows, { peekingCost: false });
    const last = result.days.at(-1)!.byArm;
    // The sequences are running-intersected, so "ever missed" is "missed on the last day".
    const missed = ["treatment", "variant-b"].map((arm) => !(last[arm].sequential.relativeCs![0] <= 0.1 && 0.1 <= last[arm].sequential.relativeCs![1]));
    if (missed[0]) missedByArm++;
    if (missed[0] || missed[1]) missedAny++;
    if (result.days.some((day) => day.byArm.treatment.call === "flat")) flatByArm++;
  }
  return { missedByArm: missedByArm / replications, missedAny: missedAny / replications, flatByArm: flatByArm / replications };
}

describe("Monte Carlo of the relative sequence at the planned minimum lift, two arms, daily looks (seeded)", () => {
  it("misses the true relative lift (and calls flat) in at most α/k of the campaigns per arm, α across arms", () => {
    const replications = 1500;
    const random = seededRandom(20260302);
    const rates = simulateMinimumLiftCampaigns(random, replications);
    expect(random.calls).toBe(replications * DAYS * 3);
    // Bonferroni α/k = 0.025 per arm; Monte Carlo standard error sqrt(p(1 − p)/R), about 0.0040 at 0.025, R = 1500.
    const perArm = plan.significanceLevel / 2;
    const perArmError = Math.sqrt((perArm * (1 - perArm)) / replications);
    expect(rates.missedByArm).toBeLessThanOrEqual(perArm + 3 * perArmError);
    expect(rates.flatByArm).toBeLessThanOrEqual(rates.missedByArm); // flat needs the sequence to exclude +10 %
    const anyError = Math.sqrt((plan.significanceLevel * (1 - plan.significanceLevel)) / replications);
    expect(rates.missedAny).toBeLessThanOrEqual(plan.significanceLevel + 3 * anyError);
  });
});

describe("A/A Monte Carlo with daily looks over four weeks (seeded)", () => {
  it("keeps the always-valid false-positive rate at or below α while naive peeking lands near its exact cost", () => {
    const random = seededRandom(20260301);
    const rates = simulateAaCampaigns(random, REPLICATIONS);
    expect(random.calls).toBe(REPLICATIONS * DAYS * 2); // the seeded generator drives every count
    // Monte Carlo error: standard error sqrt(p(1 − p)/R) with R = 3000 — about 0.0040 at p = 0.05
    // and about 0.0078 at p ≈ 0.25; the bounds below allow 3 and 4 standard errors.
    const alpha = plan.significanceLevel;
    const alwaysValidError = Math.sqrt((alpha * (1 - alpha)) / REPLICATIONS);
    expect(rates.alwaysValid).toBeLessThanOrEqual(alpha + 3 * alwaysValidError);
    // The exact error of a naive two-sided test at α after each of 28 equally spaced looks (Armitage et al. 1969),
    // by recursive numerical integration (lib/sequential/naive-peeking-error.ts), not simulation.
    const exact = naivePeekingError(equalFractions(DAYS), { significanceLevel: alpha, sides: 2 });
    const naiveError = Math.sqrt((exact * (1 - exact)) / REPLICATIONS);
    expect(Math.abs(rates.naive - exact)).toBeLessThanOrEqual(4 * naiveError);
    expect(rates.naive).toBeGreaterThan(3 * alpha);
  });

  it("depends on the seed it is given", () => {
    const first = simulateAaCampaigns(seededRandom(1), 200);
    const again = simulateAaCampaigns(seededRandom(1), 200);
    const other = simulateAaCampaigns(seededRandom(2), 200);
    expect(again).toEqual(first);
    expect(other).not.toEqual(first);
  });
});
