import { and, eq, sql } from "drizzle-orm";
import { getDb, type Database } from "@/db";
import { analysisDays, campaigns } from "@/db/schema";
import { analysisDayColumns, type StoredAnalysis } from "./analysis";
import type { CampaignDto } from "./campaigns";

/** The campaign fields the status answer reads. */
export type StatusCampaign = Pick<CampaignDto, "id" | "name" | "status" | "maxDays" | "plan" | "planChangedAt" | "countsChangedAt" | "updatedAt">;

export interface StatusSource {
  campaign: StatusCampaign;
  /** Only the latest analysis day, its detail carrying the issues of every day (oldest first). */
  stored: StoredAnalysis;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function buildStatusQuery(db: Database, by: "id" | "slug") {
  const reference = sql.placeholder("reference");
  const latestDay = sql`(select max(${analysisDays.day}) from ${analysisDays} where ${analysisDays.campaignId} = ${campaigns.id})`;
  return db
    .select({
      id: campaigns.id,
      name: campaigns.name,
      status: campaigns.status,
      maxDays: campaigns.maxDays,
      plan: campaigns.plan,
      planChangedAt: campaigns.planChangedAt,
      countsChangedAt: campaigns.countsChangedAt,
      updatedAt: campaigns.updatedAt,
      analyzedAt: campaigns.analyzedAt,
      ...analysisDayColumns,
      arms: sql<unknown>`${analysisDays.detail} -> 'arms'`,
      issues: sql<unknown[]>`(select coalesce(jsonb_agg(issue order by d.day, position), '[]'::jsonb)
        from ${analysisDays} d, jsonb_array_elements(d.detail -> 'issues') with ordinality as found(issue, position)
        where d.campaign_id = ${campaigns.id})`,
    })
    .from(campaigns)
    .leftJoin(analysisDays, and(eq(analysisDays.campaignId, campaigns.id), eq(analysisDays.day, latestDay)))
    .where(and(eq(campaigns.workspaceId, sql.placeholder("workspaceId")), by === "id" ? eq(campaigns.id, reference) : eq(campaigns.slug, reference)))
    .limit(1)
    .prepare(`status_source_by_${by}`);
}

type StatusQuery = ReturnType<typeof buildStatusQuery>;

// Built once per database client (tests close and reopen it), so a poll neither rebuilds the SQL nor has it parsed again.
const preparedByDb = new WeakMap<Database, { id: StatusQuery; slug: StatusQuery }>();

function statusQuery(by: "id" | "slug"): StatusQuery {
  const db = getDb();
  let prepared = preparedByDb.get(db);
  if (!prepared) {
    prepared = { id: buildStatusQuery(db, "id"), slug: buildStatusQuery(db, "slug") };
    preparedByDb.set(db, prepared);
  }
  return prepared[by];
}

/**
 * A workspace's campaign (by id or slug) with its latest analysis day and all stored issues, in one
 * statement (one snapshot, one round trip); null when the workspace has no such campaign.
 */
export async function getStatusSource(workspaceId: string, reference: string): Promise<StatusSource | null> {
  const byId = UUID.test(reference);
  const [row] = await statusQuery(byId ? "id" : "slug").execute({ workspaceId, reference: byId ? reference.toLowerCase() : reference });
  if (!row) return null;
  const campaign: StatusCampaign = {
    id: row.id,
    name: row.name,
    status: row.status,
    maxDays: row.maxDays,
    plan: row.plan,
    planChangedAt: row.planChangedAt?.toISOString() ?? null,
    countsChangedAt: row.countsChangedAt?.toISOString() ?? null,
    updatedAt: row.updatedAt.toISOString(),
  };
  const { analyzedAt, countsChangedAt, planChangedAt } = row;
  const days =
    row.day === null || row.daysRun === null || row.call === null
      ? []
      : [
          {
            day: row.day,
            daysRun: row.daysRun,
            call: row.call,
            liftAbsolute: row.liftAbsolute,
            liftRelative: row.liftRelative,
            sequenceLow: row.sequenceLow,
            sequenceHigh: row.sequenceHigh,
            intervalLow: row.intervalLow,
            intervalHigh: row.intervalHigh,
            fixedP: row.fixedP,
            sequentialP: row.sequentialP,
            srmSequentialP: row.srmSequentialP,
            detail: { arms: row.arms, issues: row.issues },
          },
        ];
  return { campaign, stored: { analyzedAt, countsChangedAt, planChangedAt, days } };
}
