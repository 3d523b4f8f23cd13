import { describe, expect, it } from "vitest";
import { planDesign, plannerInputSchema } from "@/lib/planner/plan-design";
import { seededRandom } from "@/lib/planner/seeded-random";
import { sampleSizeTwoProportions } from "@/lib/sequential";

const plan = plannerInputSchema.parse({ baseline: 0.05, minimumLift: 0.1, dailyUnits: 20_000, holdoutShare: 0.5 });

describe("planDesign", () => {
  it("sizes the fixed horizon with lib/sequential's sample size (itself checked against R power.prop.test)", () => {
    const result = planDesign(plan, { replicates: 20 });
    const size = sampleSizeTwoProportions({ baselineRate: 0.05, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2, holdoutShare: 0.5 });
    expect(result.fixed.perArm).toEqual({ holdout: size.holdout, treatment: size.treatment });
    expect(result.fixed.days).toBe(Math.ceil(result.fixed.total / 20_000));
    expect(result.method).toMatch(/Seeded simulation/);
  });

  it("is deterministic for a seed and uses the seed", () => {
    const first = planDesign(plan, { replicates: 30, seed: 7 });
    expect(planDesign(plan, { replicates: 30, seed: 7 }).scenarios).toEqual(first.scenarios);
    expect(planDesign(plan, { replicates: 30, seed: 8 }).scenarios).not.toEqual(first.scenarios);
    expect(seededRandom(1)()).not.toBe(seededRandom(2)());
  });

  it("reaches a call sooner the larger the true lift, and rarely calls a lift when there is none", () => {
    const result = planDesign(plan, { replicates: 200 });
    const [zero, half, mde, twice] = result.scenarios;
    expect(twice.expectedDays).toBeLessThan(mde.expectedDays);
    expect(mde.expectedDays).toBeLessThan(half.expectedDays);
    expect(twice.calls.lift).toBe(200);
    // Under no effect the always-valid false-lift rate is at most α = 0.05; with 200 runs the Monte Carlo
    // standard error is about √(0.05·0.95/200) ≈ 0.015, so allow 0.05 + 3·0.015.
    expect((zero.calls.lift + zero.calls.harm) / 200).toBeLessThanOrEqual(0.05 + 3 * 0.0155);
  });

  it("rejects plans it cannot size", () => {
    expect(plannerInputSchema.safeParse({ baseline: 1.5, minimumLift: 0.1, dailyUnits: 100 }).success).toBe(false);
    expect(plannerInputSchema.safeParse({ metric: "mean", baseline: 4, minimumLift: 0.1, dailyUnits: 100 }).success).toBe(false);
    expect(plannerInputSchema.safeParse({ baseline: 0.05, minimumLift: 0.1, dailyUnits: 5 }).success).toBe(false);
  });
});
