import { z } from "zod";
import type { CampaignDto } from "@/db/queries/campaigns";
import { getStoredAnalysis, type StoredAnalysis, type StoredAnalysisDay } from "@/db/queries/analysis";

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

/** When the numbers were computed, and whether newer counts (or a plan change) wait for the worker. */
export interface AnalysisFreshness {
  /** ISO time of the worker's last analysis; null before the first one. */
  analyzedAt: string | null;
  /** True when counts or the plan changed after the last analysis: the next worker pass will refresh the numbers. */
  stale: boolean;
}

export interface CampaignStatus extends AnalysisFreshness {
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

export interface CampaignSeries extends AnalysisFreshness {
  id: string;
  name: string;
  days: StatusDay[];
}

// The part of analysis_days.detail these endpoints read (written by cron/recompute.ts from the engine's day result).
const storedDetailSchema = z.looseObject({
  arms: z.record(z.string(), z.looseObject({ n: z.number() })),
  issues: z.array(z.object({ rule: z.string(), date: z.string().nullable(), arm: z.string(), message: z.string() })),
});

function jsonEnd(value: number | null): number | null {
  return value !== null && Number.isFinite(value) ? value : null;
}

function jsonInterval(low: number | null, high: number | null): JsonInterval {
  if (low === null && high === null) return null;
  return [jsonEnd(low), jsonEnd(high)];
}

function freshness(stored: StoredAnalysis | null): AnalysisFreshness {
  if (!stored) return { analyzedAt: null, stale: false };
  const { analyzedAt, countsChangedAt, planChangedAt } = stored;
  const countsNewer = countsChangedAt !== null && (analyzedAt === null || countsChangedAt > analyzedAt);
  const planNewer = analyzedAt !== null && planChangedAt !== null && planChangedAt > analyzedAt;
  return { analyzedAt: analyzedAt?.toISOString() ?? null, stale: countsNewer || planNewer };
}

type PlannedCampaign = Pick<CampaignDto, "maxDays" | "plan">;

function toStatusDay(campaign: PlannedCampaign, day: StoredAnalysisDay, issuesSoFar: StatusDay["health"]["issues"]): StatusDay {
  const detail = storedDetailSchema.parse(day.detail);
  const horizonReached =
    day.daysRun >= campaign.maxDays || Object.entries(campaign.plan.perArm).every(([arm, needed]) => (detail.arms[arm]?.n ?? 0) >= needed);
  return {
    date: day.day,
    daysRun: day.daysRun,
    call: day.call,
    lift: {
      absolute: jsonEnd(day.liftAbsolute),
      relative: jsonEnd(day.liftRelative),
      cs: jsonInterval(day.sequenceLow, day.sequenceHigh),
      ci: jsonInterval(day.intervalLow, day.intervalHigh),
    },
    sequential: { p: day.sequentialP },
    fixed: { p: day.fixedP, horizonReached },
    health: { srmP: day.srmSequentialP, issues: issuesSoFar },
  };
}

function seriesDays(campaign: PlannedCampaign, stored: StoredAnalysis | null): StatusDay[] {
  const issues: StatusDay["health"]["issues"] = [];
  return (stored?.days ?? []).map((day) => {
    issues.push(...storedDetailSchema.parse(day.detail).issues.map(({ rule, date, arm, message }) => ({ rule, date, arm, message })));
    return toStatusDay(campaign, day, [...issues]);
  });
}

/** Every day of the worker's stored analysis, with the issues found up to that day (empty before the first analysis). */
export async function campaignSeries(campaign: CampaignDto): Promise<CampaignSeries> {
  return seriesFromStored(campaign, await getStoredAnalysis(campaign.id));
}

/** The series from a stored analysis already read (the campaign page reads it once for the status and the series). */
export function seriesFromStored(campaign: CampaignDto, stored: StoredAnalysis | null): CampaignSeries {
  return { id: campaign.id, name: campaign.name, days: seriesDays(campaign, stored), ...freshness(stored) };
}

/** The latest stored analysis day as `GET /api/v1/campaigns/:id/status` answers it ("collecting" and null numbers before the first analysis). */
export async function campaignStatus(campaign: CampaignDto): Promise<CampaignStatus> {
  return statusFromStored(campaign, await getStoredAnalysis(campaign.id));
}

/** The status answer from a stored analysis already read (its last day carries every issue so far). */
export function statusFromStored(
  campaign: Pick<CampaignDto, "id" | "name" | "status" | "maxDays" | "plan" | "planChangedAt" | "countsChangedAt" | "updatedAt">,
  stored: StoredAnalysis | null,
): CampaignStatus {
  const last = seriesDays(campaign, stored).at(-1);
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
    ...freshness(stored),
  };
}
