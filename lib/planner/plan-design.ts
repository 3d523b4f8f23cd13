import { z } from "zod";
import { analyzeCampaign, durationDays, tauFromPlan, type CampaignPlan, type DailyCountRow } from "@/lib/sequential";
import { seededRandom, standardNormal } from "./seeded-random";

/** The planner's inputs: one treatment against a holdout, with the traffic it gets. */
export const plannerInputSchema = z
  .object({
    metric: z.enum(["conversion", "mean"]).default("conversion"),
    baseline: z.coerce.number().refine((value) => Number.isFinite(value) && value !== 0, "A non-zero baseline"),
    standardDeviation: z.coerce.number().gt(0, "Above 0").optional(),
    minimumLift: z.coerce.number().gt(0, "Above 0").max(10, "At most 1000 %"),
    alpha: z.coerce.number().gt(0, "Above 0").max(0.2, "At most 0.2").default(0.05),
    power: z.coerce.number().min(0.5, "At least 0.5").lt(1, "Below 1").default(0.8),
    sides: z.coerce.number().pipe(z.union([z.literal(1), z.literal(2)])).default(2),
    holdoutShare: z.coerce.number().gt(0, "Above 0").lt(1, "Below 1").default(0.5),
    dailyUnits: z.coerce.number().int("Whole units").min(10, "At least 10 a day").max(10_000_000, "At most 10⁷ a day"),
    maxDays: z.coerce.number().int("Whole days").min(1, "At least 1 day").max(120, "At most 120 days for the planner").optional(),
  })
  .superRefine((plan, context) => {
    if (plan.metric === "conversion" && !(plan.baseline > 0 && plan.baseline < 1)) context.addIssue({ code: "custom", path: ["baseline"], message: "A conversion rate is between 0 and 1" });
    if (plan.metric === "conversion" && plan.baseline * (1 + 2 * plan.minimumLift) >= 1) context.addIssue({ code: "custom", path: ["minimumLift"], message: "Baseline × (1 + 2 × lift) must stay below 100 %" });
    if (plan.metric === "mean" && plan.standardDeviation === undefined) context.addIssue({ code: "custom", path: ["standardDeviation"], message: "Enter the standard deviation" });
  });
export type PlannerInput = z.infer<typeof plannerInputSchema>;

export interface ScenarioResult {
  /** True relative lift as a multiple of the MDE: 0, 0.5, 1, 2. */
  multiple: number;
  trueLift: number;
  /** Mean days until the always-valid design made a call (a run without a call counts as the cap). */
  expectedDays: number;
  medianDays: number;
  /** Share of runs with a call by the cap, and which calls. */
  calledShare: number;
  calls: Record<"lift" | "harm" | "flat", number>;
}

export interface PlannerResult {
  input: PlannerInput;
  fixed: { perArm: { holdout: number; treatment: number }; total: number; days: number };
  tau: number;
  /** Days simulated at most: the cap (maxDays, or twice the fixed horizon). */
  capDays: number;
  method: string;
  replicates: number;
  seed: number;
  scenarios: ScenarioResult[];
}

const MULTIPLES = [0, 0.5, 1, 2] as const;

function dailyRows(input: PlannerInput, trueLift: number, days: number, random: () => number): DailyCountRow[] {
  const rows: DailyCountRow[] = [];
  const holdoutUnits = Math.max(1, Math.round(input.dailyUnits * input.holdoutShare));
  const treatmentUnits = Math.max(1, input.dailyUnits - holdoutUnits);
  for (let day = 0; day < days; day++) {
    const date = new Date(Date.UTC(2026, 0, 1 + day)).toISOString().slice(0, 10);
    for (const [arm, n, lift] of [["holdout", holdoutUnits, 0], ["treatment", treatmentUnits, trueLift]] as const) {
      const mean = input.baseline * (1 + lift);
      if (input.metric === "conversion") {
        const conversions = Math.min(n, Math.max(0, Math.round(n * mean + Math.sqrt(n * mean * (1 - mean)) * standardNormal(random))));
        rows.push({ date, arm, n, sum: conversions, sumSq: conversions });
      } else {
        const sd = input.standardDeviation!;
        const sum = n * mean + Math.sqrt(n) * sd * standardNormal(random);
        const spread = Math.max(0, (n - 1) * sd * sd * (1 + Math.sqrt(2 / Math.max(1, n - 1)) * standardNormal(random)));
        rows.push({ date, arm, n, sum, sumSq: (sum * sum) / n + spread });
      }
    }
  }
  return rows;
}

/**
 * The fixed-horizon plan and, for the same plan, the always-valid design's expected days to a call
 * when the true lift is 0, half, one and two times the MDE: a seeded Monte Carlo of daily counts
 * (normal approximations of the daily binomial or mean), each run analysed by lib/sequential's
 * analyzeCampaign with the plan's τ. A run without a call by the cap counts as the cap, so the means
 * are lower bounds there. Deterministic for a seed.
 */
export function planDesign(input: PlannerInput, options: { replicates?: number; seed?: number } = {}): PlannerResult {
  const replicates = options.replicates ?? 200;
  const seed = options.seed ?? 20_260_301;
  const derived = tauFromPlan({
    metric: input.metric,
    baselineRate: input.baseline,
    standardDeviation: input.standardDeviation,
    minimumLift: input.minimumLift,
    significanceLevel: input.alpha,
    power: input.power,
    sides: input.sides as 1 | 2,
    holdoutShare: input.holdoutShare,
  });
  const total = Math.max(Math.ceil(derived.sampleSize.holdout / input.holdoutShare - 1e-9), Math.ceil(derived.sampleSize.treatment / (1 - input.holdoutShare) - 1e-9));
  const fixedDays = durationDays(total, input.dailyUnits);
  const capDays = input.maxDays ?? Math.min(120, Math.max(7, 2 * fixedDays));
  const plan: CampaignPlan = {
    metric: input.metric,
    significanceLevel: input.alpha,
    power: input.power,
    sides: input.sides as 1 | 2,
    baselineRate: input.baseline,
    standardDeviation: input.standardDeviation,
    minimumLift: input.minimumLift,
    tau: derived.tau,
    maxDays: capDays + 1,
    arms: [
      { key: "holdout", share: input.holdoutShare },
      { key: "treatment", share: 1 - input.holdoutShare },
    ],
  };
  const scenarios = MULTIPLES.map((multiple, index) => {
    const random = seededRandom(seed + 7919 * index);
    const trueLift = multiple * input.minimumLift;
    const stops: number[] = [];
    const calls = { lift: 0, harm: 0, flat: 0 };
    for (let run = 0; run < replicates; run++) {
      const analysis = analyzeCampaign(plan, dailyRows(input, trueLift, capDays, random), { peekingCost: false, srmSignificanceLevel: 1e-12 });
      const stop = analysis.days.find((day) => day.call === "lift" || day.call === "harm" || day.call === "flat");
      if (stop) {
        calls[stop.call as keyof typeof calls] += 1;
        stops.push(stop.dayNumber);
      } else {
        stops.push(capDays);
      }
    }
    const sorted = [...stops].sort((a, b) => a - b);
    return {
      multiple,
      trueLift,
      expectedDays: stops.reduce((sum, days) => sum + days, 0) / stops.length,
      medianDays: sorted[Math.floor((sorted.length - 1) / 2)],
      calledShare: (calls.lift + calls.harm + calls.flat) / replicates,
      calls,
    };
  });
  return {
    input,
    fixed: { perArm: { holdout: derived.sampleSize.holdout, treatment: derived.sampleSize.treatment }, total, days: fixedDays },
    tau: derived.tau,
    capDays,
    method: `Seeded simulation on the server: ${replicates} runs per scenario of daily counts (normal approximation), each analysed day by day with the always-valid test; a run without a call by day ${capDays} counts as ${capDays} days.`,
    replicates,
    seed,
    scenarios,
  };
}
