import { and, asc, desc, eq, gt, inArray, isNull, or, sql } from "drizzle-orm";
import { getDb, type Database } from "@/db";
import { analysisDays, campaigns, organizations } from "@/db/schema";
import type { CallName } from "@/db/schema";

/** A transaction of the shared database. */

/** The figures of one analysed day, as the series and the status read them. */
export const analysisDayColumns = {
  day: analysisDays.day,
  daysRun: analysisDays.daysRun,
  call: analysisDays.call,
  liftAbsolute: analysisDays.liftAbsolute,
  liftRelative: analysisDays.liftRelative,
  sequenceLow: analysisDays.sequenceLow,
  sequenceHigh: analysisDays.sequenceHigh,
  intervalLow: analysisDays.intervalLow,
  intervalHigh: analysisDays.intervalHigh,
  fixedP: analysisDays.fixedP,
  sequentialP: analysisDays.sequentialP,
  srmSequentialP: analysisDays.srmSequentialP,
};

export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];

/** Statuses whose campaigns are analysed (a draft has no data yet, an archived one is frozen). */
const ANALYSED_STATUSES = ["running", "paused", "ended"] as const;

/**
 * Ids of the campaigns to recompute: with `all`, every analysed campaign (the nightly pass, which
 * then skips those whose inputs hash is unchanged); otherwise those never analysed or whose counts or
 * plan changed since the last analysis. Optionally restricted to `workspaceIds`.
 */
export async function listCampaignsToRecompute(options: { all?: boolean; workspaceIds?: string[] } = {}): Promise<string[]> {
  const marked = or(
    isNull(campaigns.analyzedAt),
    gt(campaigns.countsChangedAt, campaigns.analyzedAt),
    gt(campaigns.planChangedAt, campaigns.analyzedAt),
  );
  const rows = await getDb()
    .select({ id: campaigns.id })
    .from(campaigns)
    .where(
      and(
        inArray(campaigns.status, [...ANALYSED_STATUSES]),
        options.all ? undefined : marked,
        options.workspaceIds ? inArray(campaigns.workspaceId, options.workspaceIds) : undefined,
      ),
    )
    .orderBy(asc(campaigns.countsChangedAt), asc(campaigns.id));
  return rows.map((row) => row.id);
}

export interface AnalysisInputs {
  campaign: {
    id: string;
    workspaceId: string;
    name: string;
    status: string;
    metricKind: "conversion" | "mean";
    metricName: string;
    metricUnit: string | null;
    alpha: number;
    power: number;
    sides: number;
    baselineRate: number | null;
    baselineMean: number | null;
    baselineSd: number | null;
    minimumLift: number;
    tau: number;
    maxDays: number;
    currentCall: CallName;
    analysisInputsHash: string | null;
  };
  arms: { key: string; name: string; plannedShare: number; position: number }[];
  /** Daily new counts per arm, by day then arm key. */
  rows: { date: string; arm: string; n: number; sum: number; sumSq: number }[];
}

export interface AnalysisRefresh {
  campaignId: string;
  analyzedAt: Date | null;
  countsChangedAt: Date | null;
  currentCall: CallName;
  /** Counts or plan changed after the last analysis: the next worker pass will recompute. */
  pending: boolean;
  days: number;
}

/** When the campaign's analysis was last refreshed, scoped to the workspace; null when not found there. */
export async function getAnalysisRefresh(workspaceId: string, campaignId: string): Promise<AnalysisRefresh | null> {
  const rows = await getDb()
    .select({
      campaignId: campaigns.id,
      analyzedAt: campaigns.analyzedAt,
      countsChangedAt: campaigns.countsChangedAt,
      planChangedAt: campaigns.planChangedAt,
      currentCall: campaigns.currentCall,
      // Qualified by hand: inside the subquery an unqualified "id" would name analysis_days.id.
      days: sql<number>`(select count(*) from "analysis_days" where "analysis_days"."campaign_id" = "campaigns"."id")`.mapWith(Number),
    })
    .from(campaigns)
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(campaigns.id, campaignId)))
    .limit(1);
  const row = rows[0];
  if (!row) return null;
  const changed = [row.countsChangedAt, row.planChangedAt].filter((value): value is Date => value !== null);
  const pending = row.analyzedAt === null ? true : changed.some((value) => value > row.analyzedAt!);
  return { campaignId: row.campaignId, analyzedAt: row.analyzedAt, countsChangedAt: row.countsChangedAt, currentCall: row.currentCall, pending, days: row.days };
}

export interface StoredAnalysisDay {
  day: string;
  daysRun: number;
  call: CallName;
  liftAbsolute: number | null;
  liftRelative: number | null;
  sequenceLow: number | null;
  sequenceHigh: number | null;
  intervalLow: number | null;
  intervalHigh: number | null;
  fixedP: number | null;
  sequentialP: number | null;
  srmSequentialP: number | null;
  detail: unknown;
}

export interface StoredAnalysis {
  /** When the worker last analysed the campaign; null before the first analysis. */
  analyzedAt: Date | null;
  countsChangedAt: Date | null;
  planChangedAt: Date | null;
  /** The worker's analysis days, oldest first (empty before the first analysis). */
  days: StoredAnalysisDay[];
}

/**
 * The worker's stored analysis of one campaign and when it was made, read in one snapshot (a
 * recompute committing meanwhile is seen whole or not at all). Null when the campaign is gone.
 */
export async function getStoredAnalysis(campaignId: string): Promise<StoredAnalysis | null> {
  return getDb().transaction(
    async (tx) => {
      const [campaign] = await tx
        .select({ analyzedAt: campaigns.analyzedAt, countsChangedAt: campaigns.countsChangedAt, planChangedAt: campaigns.planChangedAt })
        .from(campaigns)
        .where(eq(campaigns.id, campaignId))
        .limit(1);
      if (!campaign) return null;
      const days = await tx
        .select({
          ...analysisDayColumns,
          detail: analysisDays.detail,
        })
        .from(analysisDays)
        .where(eq(analysisDays.campaignId, campaignId))
        .orderBy(asc(analysisDays.day));
      return { ...campaign, days };
    },
    { isolationLevel: "repeatable read", accessMode: "read only" },
  );
}

/** Every analysis day of a campaign, oldest first (tests and the digest read these). */
export async function listAnalysisDays(campaignId: string) {
  return getDb().select().from(analysisDays).where(eq(analysisDays.campaignId, campaignId)).orderBy(asc(analysisDays.day));
}

/** The latest analysis day of each of the campaigns. */
export async function listLatestAnalysisDays(campaignIds: string[]) {
  if (campaignIds.length === 0) return [];
  return getDb()
    .selectDistinctOn([analysisDays.campaignId])
    .from(analysisDays)
    .where(inArray(analysisDays.campaignId, campaignIds))
    .orderBy(analysisDays.campaignId, desc(analysisDays.day));
}

/** Workspaces grouped by their time zone (UTC when unset), for the passes that run at a local hour. */
export async function listWorkspaceTimeZones(): Promise<Map<string, string[]>> {
  const rows = await getDb().select({ id: organizations.id, timeZone: organizations.timeZone }).from(organizations);
  const zones = new Map<string, string[]>();
  for (const row of rows) {
    const zone = row.timeZone || "UTC";
    zones.set(zone, [...(zones.get(zone) ?? []), row.id]);
  }
  return zones;
}

export interface RunningCampaignCall {
  id: string;
  name: string;
  workspaceId: string;
  createdBy: string | null;
  currentCall: CallName;
  analyzedAt: Date | null;
  daysRun: number | null;
  liftRelative: number | null;
  sequentialP: number | null;
  fixedP: number | null;
}

/** Every running campaign of the workspace with its current call and latest analysis day, by name. */
export async function listRunningCampaignCalls(workspaceId: string): Promise<RunningCampaignCall[]> {
  const latest = sql`(select "latest"."id" from "analysis_days" as "latest" where "latest"."campaign_id" = "campaigns"."id" order by "latest"."day" desc limit 1)`;
  return getDb()
    .select({
      id: campaigns.id,
      name: campaigns.name,
      workspaceId: campaigns.workspaceId,
      createdBy: campaigns.createdBy,
      currentCall: campaigns.currentCall,
      analyzedAt: campaigns.analyzedAt,
      daysRun: analysisDays.daysRun,
      liftRelative: analysisDays.liftRelative,
      sequentialP: analysisDays.sequentialP,
      fixedP: analysisDays.fixedP,
    })
    .from(campaigns)
    .leftJoin(analysisDays, sql`${analysisDays.id} = ${latest}`)
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(campaigns.status, "running")))
    .orderBy(asc(campaigns.name));
}
