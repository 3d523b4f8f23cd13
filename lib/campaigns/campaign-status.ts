import type { CampaignDto } from "@/db/queries/campaigns";
import { listDailyCounts } from "@/db/queries/daily-counts";
import { analyzeCampaign, type CampaignAnalysis, type CampaignPlan, type DayResult, type Interval } from "@/lib/sequential";

/** An interval as JSON: an open end (one-sided bound) is null. */
export type JsonInterval = [number | null, number | null] | null;

/** One day of a campaign as the status and series endpoints answer it. */
export interface StatusDay {
  date: string;
  daysRun: number;
  call: string;
  lift: { absolute: number | null; relative: number | null; cs: JsonInterval; ci: JsonInterval };
  sequential: { p: number | null };
  fixed: { p: number | null; horizonReached: boolean };
  health: { srmP: number | null; issues: { rule: string; date: string | null; arm: string; message: string }[] };
}

export interface CampaignStatus {
  id: string;
  name: string;
  status: string;
  call: string;
  asOf: string | null;
  daysRun: number;
  lift: StatusDay["lift"];
  sequential: StatusDay["sequential"];
  fixed: StatusDay["fixed"];
  health: StatusDay["health"];
  planChangedAt: string | null;
  updatedAt: string;
}

function jsonInterval(interval: Interval | null): JsonInterval {
  if (!interval) return null;
  return interval.map((end) => (Number.isFinite(end) ? end : null)) as [number | null, number | null];
}

/** The engine's plan for a stored campaign (τ as stored, so the guarantee does not move). */
export function enginePlan(campaign: CampaignDto): CampaignPlan {
  return {
    metric: campaign.metric.kind,
    significanceLevel: campaign.alpha,
    power: campaign.power,
    sides: campaign.sides,
    baselineRate: campaign.metric.kind === "conversion" ? (campaign.baselineRate ?? undefined) : (campaign.baselineMean ?? undefined),
    standardDeviation: campaign.baselineSd ?? undefined,
    minimumLift: campaign.minimumLift,
    tau: campaign.tau,
    maxDays: campaign.maxDays,
    arms: campaign.arms.map((arm) => ({ key: arm.key, share: arm.share })),
  };
}

/** Runs the statistics engine on a campaign's stored counts (compute on read, until the worker stores analysis days). */
export async function analyzeStoredCampaign(campaign: CampaignDto): Promise<CampaignAnalysis> {
  const counts = await listDailyCounts(campaign.id);
  return analyzeCampaign(
    enginePlan(campaign),
    counts.map((count) => ({ date: count.day, arm: count.arm, n: count.units, sum: count.sum, sumSq: count.sumSquares })),
    { peekingCost: false },
  );
}

function toStatusDay(campaign: CampaignDto, day: DayResult, issuesSoFar: StatusDay["health"]["issues"]): StatusDay {
  const horizonReached =
    day.dayNumber >= campaign.maxDays || Object.entries(campaign.plan.perArm).every(([arm, needed]) => (day.arms[arm]?.n ?? 0) >= needed);
  return {
    date: day.date,
    daysRun: day.dayNumber,
    call: day.call,
    lift: { absolute: day.lift.absolute, relative: day.lift.relative, cs: jsonInterval(day.sequential.cs), ci: jsonInterval(day.fixed.ci) },
    sequential: { p: day.sequential.p },
    fixed: { p: day.fixed.p, horizonReached },
    health: { srmP: day.health.srm.sequential?.p ?? null, issues: issuesSoFar },
  };
}

/** Every day of the campaign, with the issues found up to that day. */
export async function campaignSeries(campaign: CampaignDto): Promise<StatusDay[]> {
  const analysis = await analyzeStoredCampaign(campaign);
  const issues: StatusDay["health"]["issues"] = [];
  return analysis.days.map((day) => {
    issues.push(...day.health.issues.map((issue) => ({ rule: issue.rule, date: issue.date, arm: issue.arm, message: issue.message })));
    return toStatusDay(campaign, day, [...issues]);
  });
}

/** The latest day of the campaign as `GET /api/v1/campaigns/:id/status` answers it. */
export async function campaignStatus(campaign: CampaignDto): Promise<CampaignStatus> {
  const series = await campaignSeries(campaign);
  const last = series.at(-1);
  return {
    id: campaign.id,
    name: campaign.name,
    status: campaign.status,
    call: last?.call ?? "collecting",
    asOf: last?.date ?? null,
    daysRun: last?.daysRun ?? 0,
    lift: last?.lift ?? { absolute: null, relative: null, cs: null, ci: null },
    sequential: last?.sequential ?? { p: null },
    fixed: last?.fixed ?? { p: null, horizonReached: false },
    health: last?.health ?? { srmP: null, issues: [] },
    planChangedAt: campaign.planChangedAt,
    updatedAt: campaign.countsChangedAt ?? campaign.updatedAt,
  };
}
