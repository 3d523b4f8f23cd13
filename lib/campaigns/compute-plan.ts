import { bonferroniLevel, durationDays, tauFromPlan } from "@/lib/sequential";
import { HOLDOUT_KEY, type CampaignPlanInput } from "@/lib/validation/campaigns";

/** The fixed-horizon plan stored with a campaign: units per arm, their total, and days at the expected traffic. */
export interface StoredPlan {
  perArm: Record<string, number>;
  total: number;
  days: number | null;
}

/**
 * The fixed-horizon sample size per arm and the mSPRT τ of a plan, the way `analyzeCampaign` reads it:
 * each treatment arm against the holdout at α/k (Bonferroni), τ from the first treatment arm. The
 * holdout needs the largest of its per-comparison sizes; `total` is the traffic that brings every arm
 * to its size at the planned shares, `days` that total at `dailyUnits` a day (null without it).
 * Throws RangeError (from lib/sequential) when the plan cannot be sized.
 */
export function computePlan(plan: CampaignPlanInput, dailyUnits?: number | null): { tau: number; plan: StoredPlan } {
  const holdout = plan.arms.find((arm) => arm.key === HOLDOUT_KEY);
  const treatments = plan.arms.filter((arm) => arm.key !== HOLDOUT_KEY);
  if (!holdout || treatments.length === 0) throw new RangeError("computePlan requires a holdout and a treatment arm");
  const significanceLevel = bonferroniLevel(plan.alpha, treatments.length);
  const perArm: Record<string, number> = { [HOLDOUT_KEY]: 0 };
  let tau: number | undefined;
  for (const arm of treatments) {
    const derived = tauFromPlan({
      metric: plan.metric.kind,
      baselineRate: plan.metric.kind === "conversion" ? plan.baselineRate! : plan.baselineMean!,
      standardDeviation: plan.metric.kind === "mean" ? plan.baselineSd : undefined,
      minimumLift: plan.minimumLift,
      significanceLevel,
      power: plan.power,
      sides: plan.sides,
      holdoutShare: holdout.share / (holdout.share + arm.share),
    });
    tau ??= derived.tau;
    perArm[arm.key] = derived.sampleSize.treatment;
    perArm[HOLDOUT_KEY] = Math.max(perArm[HOLDOUT_KEY], derived.sampleSize.holdout);
  }
  const total = Math.max(...plan.arms.map((arm) => Math.ceil(perArm[arm.key] / arm.share - 1e-9)));
  const days = dailyUnits ? durationDays(total, dailyUnits) : null;
  return { tau: tau!, plan: { perArm, total, days } };
}

/** The plan as the form shows it while typing: the numbers, or why they cannot be computed yet. */
export function previewPlan(plan: CampaignPlanInput, dailyUnits?: number | null): { ok: true; tau: number; plan: StoredPlan } | { ok: false; reason: string } {
  try {
    return { ok: true, ...computePlan(plan, dailyUnits) };
  } catch (error) {
    return { ok: false, reason: error instanceof Error ? error.message : "The plan cannot be sized" };
  }
}
