import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  alwaysValidSequence,
  analyzeCampaign,
  dayNumber,
  formatDay,
  lookFractions,
  naivePeekingError,
  tauFromPlan,
  twoSampleZTest,
  type CampaignPlan,
  type DailyCountRow,
} from "@/lib/sequential";
import { closeRelative } from "./tolerance";

const START = dayNumber("2026-03-01")!;
const plan: CampaignPlan = Object.freeze({
  metric: "conversion",
  significanceLevel: 0.05,
  power: 0.8,
  sides: 2,
  baselineRate: 0.1,
  minimumLift: 0.1,
  arms: Object.freeze([
    { key: "holdout", share: 0.5 },
    { key: "treatment", share: 0.5 },
  ]),
});

function series(days: number, perDay: Record<string, (day: number) => [units: number, conversions: number]>): DailyCountRow[] {
  const rows: DailyCountRow[] = [];
  for (let d = 0; d < days; d++) {
    for (const [arm, counts] of Object.entries(perDay)) {
      const [n, x] = counts(d);
      rows.push({ date: formatDay(START + d), arm, n, sum: x, sumSq: x });
    }
  }
  return Object.freeze(rows) as DailyCountRow[];
}

describe("analyzeCampaign — the daily numbers", () => {
  const rows = series(5, { holdout: (d) => [1000, 100 + d], treatment: (d) => [1000, 112 + 2 * d] });
  const result = analyzeCampaign(plan, rows);

  it("derives τ from the plan and keeps cumulative arms per calendar day", () => {
    expect(result.tau).toBe(tauFromPlan({ metric: "conversion", baselineRate: 0.1, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2 }).tau);
    expect(result.tauRelative).toBe(result.tau / 0.1);
    expect(result.days.map((day) => day.date)).toEqual(["2026-03-01", "2026-03-02", "2026-03-03", "2026-03-04", "2026-03-05"]);
    expect(result.days[2].arms.treatment).toEqual({ n: 3000, sum: 112 + 114 + 116, sumSq: 342 });
    expect(result.plannedSampleSize!.treatment.treatment).toBe(14751);
  });

  it("reports the same fixed-horizon test as twoSampleZTest and the same sequence as alwaysValidSequence", () => {
    const looks = result.days.map((day) => {
      const test = twoSampleZTest(day.arms.treatment, day.arms.holdout);
      expect(day.fixed.z).toBe(test.pooled.z);
      expect(day.fixed.p).toBe(test.pooled.p);
      expect(day.fixed.ci).toEqual(test.ci.absolute);
      expect(day.lift.relative).toBe(test.relative);
      const t = day.arms.treatment.sum / day.arms.treatment.n;
      const c = day.arms.holdout.sum / day.arms.holdout.n;
      return { estimate: t - c, variance: (t * (1 - t)) / day.arms.treatment.n + (c * (1 - c)) / day.arms.holdout.n };
    });
    const sequence = alwaysValidSequence(looks, { tau: result.tau, significanceLevel: 0.05 });
    result.days.forEach((day, i) => {
      expect(closeRelative(day.sequential.p, sequence[i].p, 1e-12)).toBe(true);
      expect(closeRelative(day.sequential.cs[0], sequence[i].cs[0], 1e-12)).toBe(true);
      expect(closeRelative(day.sequential.cs[1], sequence[i].cs[1], 1e-12)).toBe(true);
      expect(day.byArm.treatment.sequential).toBe(day.sequential);
      expect(day.sequential.relativeCs![0]).toBeLessThan(day.lift.relative!);
    });
  });

  it("computes the cost of peeking once, for the actual looks", () => {
    const units = result.days.map((day) => day.arms.treatment.n + day.arms.holdout.n);
    expect(result.peekingLooks).toBe(5);
    expect(result.peekingCost).toBe(naivePeekingError(lookFractions(units), { significanceLevel: 0.05, sides: 2 }));
    expect(analyzeCampaign(plan, rows, { peekingCost: false }).peekingCost).toBeNull();
  });
});

describe("analyzeCampaign — the calls", () => {
  it("calls lift on a large true lift", () => {
    const result = analyzeCampaign(plan, series(10, { holdout: () => [2000, 200], treatment: () => [2000, 260] }));
    expect(result.days[0].call).toBe("collecting");
    expect(result.days.at(-1)!.call).toBe("lift");
    expect(result.days.at(-1)!.sequential.cs[0]).toBeGreaterThan(0);
  });
  it("calls harm when the campaign hurts", () => {
    const result = analyzeCampaign(plan, series(10, { holdout: () => [2000, 260], treatment: () => [2000, 200] }));
    expect(result.days.at(-1)!.call).toBe("harm");
  });
  it("calls flat when the sequence excludes the minimum lift worth having", () => {
    const result = analyzeCampaign(plan, series(60, { holdout: () => [5000, 500], treatment: () => [5000, 500] }));
    const last = result.days.at(-1)!;
    expect(last.sequential.cs[1]).toBeLessThan(0.1 * 0.1);
    expect(last.call).toBe("flat");
  });
  it("calls horizon on the planned last day without a call", () => {
    const result = analyzeCampaign({ ...plan, maxDays: 3 }, series(4, { holdout: () => [500, 50], treatment: () => [500, 52] }));
    expect(result.days.map((day) => day.call)).toEqual(["collecting", "collecting", "horizon", "horizon"]);
  });
  it("calls suspect from the day of a gap on", () => {
    const rows = series(4, { holdout: () => [1000, 100], treatment: () => [1000, 150] }).filter((row) => !(row.arm === "treatment" && row.date === "2026-03-02"));
    const result = analyzeCampaign(plan, rows);
    expect(result.days.map((day) => day.call)).toEqual(["collecting", "suspect", "suspect", "suspect"]);
    expect(result.days[1].health.issues.map((issue) => issue.rule)).toEqual(["gap"]);
  });
  it("calls suspect on a sample-ratio mismatch (anytime-valid SRM p < 0.001)", () => {
    const result = analyzeCampaign(plan, series(5, { holdout: () => [1000, 100], treatment: () => [1150, 115] }));
    const last = result.days.at(-1)!;
    expect(last.health.srm.sequential!.p).toBeLessThan(0.001);
    expect(last.health.srm.chiSquare!.p).toBeLessThan(1e-6);
    expect(last.call).toBe("suspect");
    expect(result.days[0].call).toBe("collecting");
  });
  it("calls suspect without numbers when cumulative conversions exceed units", () => {
    const result = analyzeCampaign(plan, series(2, { holdout: (d) => [10, d === 1 ? 30 : 1], treatment: () => [10, 1] }));
    expect(result.days[1].call).toBe("suspect");
    expect(result.days[1].fixed.z).toBeNull();
    expect(result.days[1].sequential.p).toBe(result.days[0].sequential.p);
  });
  it("leaves early days without conversions unestimated instead of NaN", () => {
    const result = analyzeCampaign(plan, series(3, { holdout: (d) => [d === 0 ? 0 : 100, d === 0 ? 0 : 10], treatment: () => [100, 12] }));
    expect(result.days[0].fixed).toEqual({ z: null, p: null, ci: null, relativeCi: null, zUnpooled: null });
    expect(result.days[0].sequential).toEqual({ p: 1, cs: [-Infinity, Infinity], relativeCs: [-1, Infinity] });
    expect(JSON.stringify(result)).not.toContain("NaN");
  });
});

describe("analyzeCampaign — several treatment arms", () => {
  const threeArms: CampaignPlan = {
    ...plan,
    arms: [
      { key: "holdout", share: 0.2 },
      { key: "treatment", share: 0.4 },
      { key: "variant-b", share: 0.4 },
    ],
  };
  const result = analyzeCampaign(threeArms, series(10, { holdout: () => [1000, 100], treatment: () => [2000, 204], "variant-b": () => [2000, 300] }));
  it("uses Bonferroni α/k for every arm and aggregates the call", () => {
    expect(result.armSignificanceLevel).toBe(0.025);
    expect(result.treatmentArms).toEqual(["treatment", "variant-b"]);
    const last = result.days.at(-1)!;
    expect(Object.keys(last.byArm)).toEqual(["treatment", "variant-b"]);
    expect(last.byArm["variant-b"].call).toBe("lift");
    expect(last.byArm.treatment.call).toBe("collecting");
    expect(last.leadingArm).toBe("variant-b");
    expect(last.call).toBe("lift");
    const test = twoSampleZTest(last.arms["variant-b"], last.arms.holdout, { significanceLevel: 0.025 });
    expect(last.byArm["variant-b"].fixed.ci).toEqual(test.ci.absolute);
    expect(result.plannedSampleSize!.treatment.holdout).toBeLessThan(result.plannedSampleSize!.treatment.treatment);
  });
});

describe("analyzeCampaign — properties and guards", () => {
  it("never raises the always-valid p and never widens the sequences, whatever the data", () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 400 }), fc.integer({ min: 0, max: 400 }), fc.double({ min: 0, max: 0.3, noNaN: true }), fc.double({ min: 0, max: 0.3, noNaN: true })), {
          minLength: 1,
          maxLength: 30,
        }),
        (days) => {
          const rows = days.flatMap(([nC, nT, rC, rT], d) => [
            { date: formatDay(START + d), arm: "holdout", n: nC, sum: Math.round(nC * rC), sumSq: Math.round(nC * rC) },
            { date: formatDay(START + d), arm: "treatment", n: nT, sum: Math.round(nT * rT), sumSq: Math.round(nT * rT) },
          ]);
          const result = analyzeCampaign({ ...plan, tau: 0.01 }, rows, { peekingCost: false });
          result.days.forEach((day, i) => {
            expect(day.sequential.p >= 0 && day.sequential.p <= 1).toBe(true);
            if (day.fixed.p !== null) expect(day.fixed.p >= 0 && day.fixed.p <= 1).toBe(true);
            if (i === 0) return;
            const before = result.days[i - 1].sequential;
            expect(day.sequential.p).toBeLessThanOrEqual(before.p);
            expect(day.sequential.cs[0]).toBeGreaterThanOrEqual(before.cs[0]);
            expect(day.sequential.cs[1]).toBeLessThanOrEqual(before.cs[1]);
          });
        },
      ),
      { numRuns: 60 },
    );
  });
  it("throws a RangeError for each guard of the plan", () => {
    const rows: DailyCountRow[] = [];
    expect(() => analyzeCampaign({ ...plan, metric: "ratio" as "mean" }, rows)).toThrow(/analyzeCampaign requires metric/);
    expect(() => analyzeCampaign({ ...plan, significanceLevel: 0 }, rows)).toThrow(/analyzeCampaign requires significanceLevel in \(0, 1\)/);
    expect(() => analyzeCampaign({ ...plan, sides: 3 as 2 }, rows)).toThrow(/analyzeCampaign requires sides 1 or 2/);
    expect(() => analyzeCampaign({ ...plan, arms: [{ key: "treatment", share: 1 }] }, rows)).toThrow(/analyzeCampaign requires an arm "holdout"/);
    expect(() => analyzeCampaign({ ...plan, arms: [{ key: "holdout", share: 1 }] }, rows)).toThrow(/analyzeCampaign requires at least one treatment arm/);
    expect(() => analyzeCampaign({ ...plan, arms: [{ key: "holdout", share: 0 }, { key: "treatment", share: 1 }] }, rows)).toThrow(/analyzeCampaign requires every share > 0/);
    expect(() => analyzeCampaign({ ...plan, arms: [{ key: "holdout", share: 0.5 }, { key: "holdout", share: 0.5 }] }, rows)).toThrow(/analyzeCampaign requires unique arm keys/);
    expect(() => analyzeCampaign({ ...plan, arms: [{ key: "holdout", share: 0.5 }, { key: "treatment", share: 0.6 }] }, rows)).toThrow(/analyzeCampaign requires shares summing to 1/);
    expect(() => analyzeCampaign({ ...plan, baselineRate: undefined }, rows)).toThrow(/analyzeCampaign requires tau, or baselineRate, minimumLift and power/);
    expect(() => analyzeCampaign({ ...plan, tau: -1 }, rows)).toThrow(/analyzeCampaign requires tau > 0/);
    expect(() => analyzeCampaign({ ...plan, maxDays: 0 }, rows)).toThrow(/analyzeCampaign requires maxDays to be a positive integer/);
    expect(() => analyzeCampaign(plan, null as unknown as DailyCountRow[])).toThrow(/analyzeCampaign requires rows to be an array/);
  });
});
