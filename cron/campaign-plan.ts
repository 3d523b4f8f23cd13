import { HOLDOUT_ARM, type CampaignPlan, type Sides } from "@/lib/sequential";

/** The campaign columns the statistics need. */
export interface PlannedCampaign {
  metricKind: "conversion" | "mean";
  alpha: number;
  power: number;
  sides: number;
  baselineRate: number | null;
  baselineMean: number | null;
  baselineSd: number | null;
  minimumLift: number;
  tau: number;
  maxDays: number;
}

/** An arm as stored: key, planned share and display order. */
export interface PlannedArmRow {
  key: string;
  plannedShare: number;
  position: number;
}

/**
 * The engine's plan for a stored campaign: holdout first, then the treatment arms in display order,
 * τ as stored (so the guarantee does not move once data arrives). The same plan the command line
 * builds from `--alpha --tau --baseline --mde --power --sd --sides --max-days --holdout-share`.
 */
export function campaignPlan(campaign: PlannedCampaign, arms: readonly PlannedArmRow[]): CampaignPlan {
  const ordered = [...arms].sort((a, b) => a.position - b.position || a.key.localeCompare(b.key));
  const holdout = ordered.filter((arm) => arm.key === HOLDOUT_ARM);
  const treatments = ordered.filter((arm) => arm.key !== HOLDOUT_ARM);
  const baseline = campaign.metricKind === "conversion" ? campaign.baselineRate : campaign.baselineMean;
  return {
    metric: campaign.metricKind,
    significanceLevel: campaign.alpha,
    power: campaign.power,
    sides: campaign.sides as Sides,
    baselineRate: baseline ?? undefined,
    minimumLift: campaign.minimumLift,
    standardDeviation: campaign.metricKind === "mean" ? (campaign.baselineSd ?? undefined) : undefined,
    tau: campaign.tau,
    maxDays: campaign.maxDays,
    arms: [...holdout, ...treatments].map((arm) => ({ key: arm.key, share: arm.plannedShare })),
  };
}
