import fc from "fast-check";
import { describe, expect, it } from "vitest";
import statsmodels from "../reference/fixtures/fixed-ztest.json";
import {
  alwaysValidSequence,
  analyzeCampaign,
  confidenceSequenceHalfWidth,
  dayNumber,
  formatDay,
  lookFractions,
  naivePeekingError,
  tauFromPlan,
  twoSampleZTest,
  type ArmDayResult,
  type CampaignPlan,
  type DailyCountRow,
  type DayResult,
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

describe("analyzeCampaign — the relative sequence is valid at α/k and running-intersected", () => {
  // Delta-method variance of log(m_T/m_C) from statsmodels 0.13.5
  // confint_proportions_2indep(xT, nT, xC, nC, method="log", compare="ratio", alpha) (tests/reference/fixed-ztest.py):
  // its log-interval is centre ± z·sqrt(V) with z = qnorm(1 − alpha/2) (scipy.stats.norm.ppf(0.975) = 1.959963984540054,
  // norm.ppf(0.95) = 1.6448536269514722, scipy 1.10.1, typed in), so V = ((log(1 + upper) − log(1 + lower)) / (2z))².
  // The sequence at α/k is then centre ± h(V, τ/baseline, α/k) with h the closed form checked in msprt.test.ts.
  const QUANTILE: Record<number, number> = { 0.05: 1.959963984540054, 0.1: 1.6448536269514722 };
  const threeArms: CampaignPlan = {
    ...plan,
    tau: 0.02,
    arms: [
      { key: "holdout", share: 1 / 3 },
      { key: "treatment", share: 1 / 3 },
      { key: "variant-b", share: 1 / 3 },
    ],
  };
  for (const c of statsmodels.proportions.filter((entry) => entry.ciRelative)) {
    it(`matches statsmodels' ratio variance for ${c.treatment.join("/")} vs ${c.holdout.join("/")}, at α/2 for two arms`, () => {
      const [xT, nT] = c.treatment;
      const [xC, nC] = c.holdout;
      const rows: DailyCountRow[] = [
        { date: "2026-03-01", arm: "holdout", n: nC, sum: xC, sumSq: xC },
        { date: "2026-03-01", arm: "treatment", n: nT, sum: xT, sumSq: xT },
        { date: "2026-03-01", arm: "variant-b", n: nT, sum: xT, sumSq: xT },
      ];
      const result = analyzeCampaign(threeArms, rows, { peekingCost: false });
      expect(result.armSignificanceLevel).toBe(0.025);
      const logLower = Math.log1p(c.ciRelative![0]);
      const logUpper = Math.log1p(c.ciRelative![1]);
      const centre = (logLower + logUpper) / 2;
      const variance = ((logUpper - logLower) / (2 * QUANTILE[c.alpha])) ** 2;
      const half = confidenceSequenceHalfWidth(variance, 0.02 / 0.1, 0.025);
      for (const arm of ["treatment", "variant-b"]) {
        const relativeCs = result.days[0].byArm[arm].sequential.relativeCs!;
        expect(closeRelative(relativeCs[0], Math.expm1(centre - half), 1e-9)).toBe(true);
        expect(closeRelative(relativeCs[1], Math.expm1(centre + half), 1e-9)).toBe(true);
      }
    });
  }

  it("intersects the relative sequences over the days, as alwaysValidSequence does on the log ratio", () => {
    const rows = series(12, { holdout: (d) => [800 + 10 * d, 80 + (d % 3)], treatment: (d) => [800 + 10 * d, 86 - (d % 4)], "variant-b": (d) => [800 + 10 * d, 79 + (d % 5)] });
    const result = analyzeCampaign(threeArms, rows, { peekingCost: false });
    for (const arm of ["treatment", "variant-b"]) {
      const looks = result.days.map((day) => {
        const [t, c] = [day.arms[arm], day.arms.holdout];
        return { estimate: Math.log(t.sum / t.n / (c.sum / c.n)), variance: 1 / t.sum - 1 / t.n + 1 / c.sum - 1 / c.n };
      });
      const sequence = alwaysValidSequence(looks, { tau: 0.02 / 0.1, significanceLevel: 0.025 });
      result.days.forEach((day, i) => {
        const relativeCs = day.byArm[arm].sequential.relativeCs!;
        expect(closeRelative(relativeCs[0], Math.expm1(sequence[i].cs[0]), 1e-9)).toBe(true);
        expect(closeRelative(relativeCs[1], Math.expm1(sequence[i].cs[1]), 1e-9)).toBe(true);
        if (i > 0) {
          const before = result.days[i - 1].byArm[arm].sequential.relativeCs!;
          expect(relativeCs[0]).toBeGreaterThanOrEqual(before[0]);
          expect(relativeCs[1]).toBeLessThanOrEqual(before[1]);
        }
      });
    }
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
    expect(last.sequential.relativeCs![1]).toBeLessThan(0.1);
    expect(last.call).toBe("flat");
  });
  it("does not call flat while the relative sequence holds the minimum lift, the holdout running below the planned baseline", () => {
    // Planned baseline 4 %, minimum lift +10 %; observed holdout 3.2 %, treatment 3.3 % (+3.1 %).
    const low: CampaignPlan = { ...plan, baselineRate: 0.04, maxDays: 60 };
    const result = analyzeCampaign(low, series(30, { holdout: () => [10000, 320], treatment: () => [10000, 330] }));
    const contradicting = result.days.filter((day) => day.sequential.cs[1] < 0.04 * 0.1 && day.sequential.relativeCs![1] >= 0.1);
    expect(contradicting.length).toBeGreaterThan(3); // the absolute-only rule called these days flat
    for (const day of contradicting) expect(day.call).toBe("collecting");
    const last = result.days.at(-1)!;
    expect(last.sequential.relativeCs![1]).toBeLessThan(0.1);
    expect(last.call).toBe("flat");
  });
  it("does not call flat while the absolute sequence holds the planned minimum, the holdout running above the planned baseline", () => {
    // Planned baseline 4 % (absolute minimum 0.004); observed holdout 6 %, treatment 6.2 %.
    const high: CampaignPlan = { ...plan, baselineRate: 0.04, maxDays: 60 };
    const result = analyzeCampaign(high, series(30, { holdout: () => [10000, 600], treatment: () => [10000, 620] }));
    const disagreeing = result.days.filter((day) => day.sequential.relativeCs![1] < 0.1 && day.sequential.cs[1] >= 0.004);
    expect(disagreeing.length).toBeGreaterThan(0);
    for (const day of disagreeing) expect(day.call).toBe("collecting");
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

/** The stop conditions an arm's printed numbers show (DESIGN.md §3 "Calls"), read off the reported intervals. */
function shownStops(result: ArmDayResult, armSignificanceLevel: number, planned: { baselineRate: number; minimumLift: number }) {
  const { p, cs, relativeCs } = result.sequential;
  const relative = relativeCs!;
  return {
    harm: cs[1] < 0 && relative[1] < 0,
    lift: p < armSignificanceLevel && cs[0] > 0 && relative[0] > 0,
    flat: relative[1] < planned.minimumLift && cs[1] < planned.baselineRate * planned.minimumLift,
  };
}

describe("analyzeCampaign — the call never contradicts the intervals it reports", () => {
  it("calls a stop exactly when every printed sequence shows it, per arm and for the campaign (property)", () => {
    const arm = fc.record({ effect: fc.double({ min: -0.35, max: 0.35, noNaN: true }) });
    const seen = new Set<string>();
    fc.assert(
      fc.property(
        fc.record({
          baselineRate: fc.double({ min: 0.02, max: 0.2, noNaN: true }),
          holdoutRate: fc.double({ min: 0.015, max: 0.25, noNaN: true }),
          minimumLift: fc.double({ min: 0.03, max: 0.3, noNaN: true }),
          arms: fc.array(arm, { minLength: 1, maxLength: 3 }),
          unitsPerDay: fc.integer({ min: 200, max: 6000 }),
          days: fc.integer({ min: 1, max: 25 }),
          maxDays: fc.option(fc.integer({ min: 1, max: 30 }), { nil: undefined }),
          seed: fc.integer(),
        }),
        (c) => {
          const keys = c.arms.map((_, i) => (i === 0 ? "treatment" : `variant-${i}`));
          const share = 1 / (keys.length + 1);
          const campaignPlan: CampaignPlan = {
            ...plan,
            baselineRate: c.baselineRate,
            minimumLift: c.minimumLift,
            maxDays: c.maxDays,
            arms: [{ key: "holdout", share }, ...keys.map((key) => ({ key, share }))],
          };
          let state = c.seed >>> 0;
          const jitter = () => ((state = (Math.imul(state, 1664525) + 1013904223) >>> 0) / 4294967296 - 0.5) * 0.2;
          const rates: Record<string, number> = { holdout: c.holdoutRate };
          keys.forEach((key, i) => (rates[key] = Math.min(0.9, c.holdoutRate * (1 + c.arms[i].effect))));
          const rows: DailyCountRow[] = [];
          for (let d = 0; d < c.days; d++) {
            for (const key of ["holdout", ...keys]) {
              const x = Math.round(c.unitsPerDay * rates[key] * (1 + jitter()));
              rows.push({ date: formatDay(START + d), arm: key, n: c.unitsPerDay, sum: x, sumSq: x });
            }
          }
          const result = analyzeCampaign(campaignPlan, rows, { peekingCost: false });
          result.days.forEach((day: DayResult) => {
            for (const key of keys) {
              const armResult = day.byArm[key];
              const stops = shownStops(armResult, result.armSignificanceLevel, c);
              if (!day.health.ok) {
                expect(armResult.call).toBe("suspect");
                continue;
              }
              expect(armResult.call === "harm").toBe(stops.harm);
              expect(armResult.call === "lift").toBe(!stops.harm && stops.lift);
              expect(armResult.call === "flat").toBe(!stops.harm && !stops.lift && stops.flat);
              seen.add(armResult.call);
            }
            // The headline numbers are those of an arm whose own call is the campaign's call.
            expect(day.sequential).toBe(day.byArm[day.leadingArm].sequential);
            expect(day.byArm[day.leadingArm].call).toBe(day.call);
          });
        },
      ),
      { numRuns: 150 },
    );
    expect([...seen].sort()).toEqual(expect.arrayContaining(["collecting", "flat", "harm", "lift"])); // the property met every stop
  });

  it("shows the arm the campaign call rests on, not merely the smallest p", () => {
    const threeArms: CampaignPlan = {
      ...plan,
      arms: [
        { key: "holdout", share: 1 / 3 },
        { key: "treatment", share: 1 / 3 },
        { key: "variant-b", share: 1 / 3 },
      ],
    };
    // treatment hurts (harm); variant-b lifts more clearly (smaller p): the campaign call is harm, shown with treatment's numbers.
    const result = analyzeCampaign(threeArms, series(10, { holdout: () => [2000, 260], treatment: () => [2000, 215], "variant-b": () => [2000, 400] }));
    const last = result.days.at(-1)!;
    expect(last.byArm["variant-b"].sequential.p).toBeLessThan(last.byArm.treatment.sequential.p);
    expect(last.byArm.treatment.call).toBe("harm");
    expect(last.byArm["variant-b"].call).toBe("lift");
    expect(last.call).toBe("harm");
    expect(last.leadingArm).toBe("treatment");
    expect(last.sequential.relativeCs![1]).toBeLessThan(0);
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
