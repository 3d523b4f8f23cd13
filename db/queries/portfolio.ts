import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { analysisDays, campaigns, type CallName, type CampaignStatus } from "@/db/schema";

/** How many of the latest days the portfolio's trend shows. */
export const TREND_DAYS = 21;

/** One campaign as the portfolio lists it; statistics are the worker's latest analysis day (null before one). */
export interface PortfolioRow {
  id: string;
  slug: string;
  name: string;
  status: CampaignStatus;
  call: CallName;
  metricKind: "conversion" | "mean";
  metricName: string;
  metricUnit: string | null;
  maxDays: number;
  plannedDays: number | null;
  daysRun: number | null;
  asOf: string | null;
  liftRelative: number | null;
  liftAbsolute: number | null;
  /** Always-valid confidence sequence of the relative lift (null ends are open). */
  relativeSequence: [number | null, number | null] | null;
  sequentialP: number | null;
  naiveP: number | null;
  /** The relative lift of the latest days, oldest first (null where not estimable). */
  trend: (number | null)[];
  analyzedAt: string | null;
  createdAt: string;
}

/** Every campaign of the workspace with its call and latest statistics, newest first. */
export async function listPortfolio(workspaceId: string): Promise<PortfolioRow[]> {
  const db = getDb();
  const rows = await db
    .select({
      id: campaigns.id,
      slug: campaigns.slug,
      name: campaigns.name,
      status: campaigns.status,
      call: campaigns.currentCall,
      metricKind: campaigns.metricKind,
      metricName: campaigns.metricName,
      metricUnit: campaigns.metricUnit,
      maxDays: campaigns.maxDays,
      plan: campaigns.plan,
      analyzedAt: campaigns.analyzedAt,
      createdAt: campaigns.createdAt,
    })
    .from(campaigns)
    .where(eq(campaigns.workspaceId, workspaceId))
    .orderBy(sql`${campaigns.createdAt} desc`);
  const ids = rows.map((row) => row.id);
  const days =
    ids.length === 0
      ? []
      : await db
          .select({
            campaignId: analysisDays.campaignId,
            day: analysisDays.day,
            daysRun: analysisDays.daysRun,
            liftRelative: analysisDays.liftRelative,
            liftAbsolute: analysisDays.liftAbsolute,
            relativeSequence: sql<[number | null, number | null] | null>`${analysisDays.detail}->'relativeSequence'`,
            sequentialP: analysisDays.sequentialP,
            fixedP: analysisDays.fixedP,
          })
          .from(analysisDays)
          .where(and(inArray(analysisDays.campaignId, ids)))
          .orderBy(asc(analysisDays.campaignId), asc(analysisDays.day));
  const byCampaign = new Map<string, typeof days>();
  for (const day of days) byCampaign.set(day.campaignId, [...(byCampaign.get(day.campaignId) ?? []), day]);
  return rows.map((row) => {
    const series = byCampaign.get(row.id) ?? [];
    const last = series.at(-1);
    return {
      id: row.id,
      slug: row.slug,
      name: row.name,
      status: row.status,
      call: row.call,
      metricKind: row.metricKind,
      metricName: row.metricName,
      metricUnit: row.metricUnit,
      maxDays: row.maxDays,
      plannedDays: row.plan.days,
      daysRun: last?.daysRun ?? null,
      asOf: last?.day ?? null,
      liftRelative: last?.liftRelative ?? null,
      liftAbsolute: last?.liftAbsolute ?? null,
      relativeSequence: Array.isArray(last?.relativeSequence) ? last.relativeSequence : null,
      sequentialP: last?.sequentialP ?? null,
      naiveP: last?.fixedP ?? null,
      trend: series.slice(-TREND_DAYS).map((day) => day.liftRelative),
      analyzedAt: row.analyzedAt?.toISOString() ?? null,
      createdAt: row.createdAt.toISOString(),
    };
  });
}
