import { and, asc, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { getDb, type Database } from "@/db";
import { arms, campaigns, dailyCounts, type Campaign, type CampaignStatus } from "@/db/schema";

export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

export interface ArmDto {
  id: string;
  key: string;
  name: string;
  share: number;
  isHoldout: boolean;
}

/** A campaign as every screen and the API see it. */
export interface CampaignDto {
  id: string;
  workspaceId: string;
  slug: string;
  name: string;
  hypothesis: string;
  metric: { kind: "conversion" | "mean"; name: string; unit: string | null };
  baselineRate: number | null;
  baselineMean: number | null;
  baselineSd: number | null;
  minimumLift: number;
  alpha: number;
  power: number;
  sides: 1 | 2;
  arms: ArmDto[];
  startDate: string;
  maxDays: number;
  dailyUnits: number | null;
  tau: number;
  plan: { perArm: Record<string, number>; total: number; days: number | null };
  status: CampaignStatus;
  currentCall: string;
  planChangedAt: string | null;
  countsChangedAt: string | null;
  createdBy: string | null;
  createdAt: string;
  updatedAt: string;
}

const campaignColumns = {
  id: campaigns.id,
  workspaceId: campaigns.workspaceId,
  slug: campaigns.slug,
  name: campaigns.name,
  hypothesis: campaigns.hypothesis,
  metricKind: campaigns.metricKind,
  metricName: campaigns.metricName,
  metricUnit: campaigns.metricUnit,
  baselineRate: campaigns.baselineRate,
  baselineMean: campaigns.baselineMean,
  baselineSd: campaigns.baselineSd,
  minimumLift: campaigns.minimumLift,
  alpha: campaigns.alpha,
  power: campaigns.power,
  sides: campaigns.sides,
  startDate: campaigns.startDate,
  maxDays: campaigns.maxDays,
  dailyUnits: campaigns.dailyUnits,
  tau: campaigns.tau,
  plan: campaigns.plan,
  status: campaigns.status,
  currentCall: campaigns.currentCall,
  planChangedAt: campaigns.planChangedAt,
  countsChangedAt: campaigns.countsChangedAt,
  createdBy: campaigns.createdBy,
  createdAt: campaigns.createdAt,
  updatedAt: campaigns.updatedAt,
};

type CampaignRow = Pick<Campaign, keyof typeof campaignColumns>;

function toDto(row: CampaignRow, armRows: ArmDto[]): CampaignDto {
  return {
    id: row.id,
    workspaceId: row.workspaceId,
    slug: row.slug,
    name: row.name,
    hypothesis: row.hypothesis,
    metric: { kind: row.metricKind, name: row.metricName, unit: row.metricUnit },
    baselineRate: row.baselineRate,
    baselineMean: row.baselineMean,
    baselineSd: row.baselineSd,
    minimumLift: row.minimumLift,
    alpha: row.alpha,
    power: row.power,
    sides: row.sides === 1 ? 1 : 2,
    arms: armRows,
    startDate: row.startDate,
    maxDays: row.maxDays,
    dailyUnits: row.dailyUnits,
    tau: row.tau,
    plan: row.plan,
    status: row.status,
    currentCall: row.currentCall,
    planChangedAt: row.planChangedAt?.toISOString() ?? null,
    countsChangedAt: row.countsChangedAt?.toISOString() ?? null,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

async function armsOf(executor: Executor, campaignIds: string[]): Promise<Map<string, ArmDto[]>> {
  const byCampaign = new Map<string, ArmDto[]>();
  if (campaignIds.length === 0) return byCampaign;
  const rows = await executor
    .select({ id: arms.id, campaignId: arms.campaignId, key: arms.key, name: arms.name, share: arms.plannedShare, isHoldout: arms.isHoldout })
    .from(arms)
    .where(inArray(arms.campaignId, campaignIds))
    .orderBy(asc(arms.position), asc(arms.key));
  for (const { campaignId, ...arm } of rows) {
    const list = byCampaign.get(campaignId) ?? [];
    list.push(arm);
    byCampaign.set(campaignId, list);
  }
  return byCampaign;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** One campaign of the workspace by id or slug, or null (another workspace's campaign is null too). */
export async function getCampaign(workspaceId: string, reference: string, executor: Executor = getDb()): Promise<CampaignDto | null> {
  const match = UUID.test(reference) ? eq(campaigns.id, reference.toLowerCase()) : eq(campaigns.slug, reference);
  const [row] = await executor.select(campaignColumns).from(campaigns).where(and(eq(campaigns.workspaceId, workspaceId), match)).limit(1);
  if (!row) return null;
  const armMap = await armsOf(executor, [row.id]);
  return toDto(row, armMap.get(row.id) ?? []);
}

/** The workspace's campaigns, newest first, optionally of one status. */
export async function listCampaigns(workspaceId: string, filter: { status?: CampaignStatus } = {}): Promise<CampaignDto[]> {
  const db = getDb();
  const rows = await db
    .select(campaignColumns)
    .from(campaigns)
    .where(and(eq(campaigns.workspaceId, workspaceId), filter.status ? eq(campaigns.status, filter.status) : undefined))
    .orderBy(desc(campaigns.createdAt));
  const armMap = await armsOf(db, rows.map((row) => row.id));
  return rows.map((row) => toDto(row, armMap.get(row.id) ?? []));
}

export interface NewCampaignValues {
  workspaceId: string;
  createdBy: string | null;
  name: string;
  hypothesis: string;
  metricKind: "conversion" | "mean";
  metricName: string;
  metricUnit: string | null;
  baselineRate: number | null;
  baselineMean: number | null;
  baselineSd: number | null;
  minimumLift: number;
  alpha: number;
  power: number;
  sides: 1 | 2;
  startDate: string;
  maxDays: number;
  dailyUnits: number | null;
  tau: number;
  plan: CampaignDto["plan"];
  arms: { key: string; name: string; share: number }[];
}

function slugify(name: string): string {
  const base = name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/(^-|-$)/g, "")
    .slice(0, 60);
  return base === "" ? "campaign" : /^[0-9a-f]{8}-/.test(base) ? `c-${base}` : base;
}

/** Inserts a campaign and its arms in one transaction; the slug is the name's, made unique in the workspace. */
export async function createCampaign(values: NewCampaignValues): Promise<CampaignDto> {
  return getDb().transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${"campaign-slug:" + values.workspaceId}, 0))`);
    const base = slugify(values.name);
    const taken = await tx
      .select({ slug: campaigns.slug })
      .from(campaigns)
      .where(and(eq(campaigns.workspaceId, values.workspaceId), sql`(${campaigns.slug} = ${base} or ${campaigns.slug} like ${base + "-%"})`));
    const used = new Set(taken.map((row) => row.slug));
    let slug = base;
    for (let suffix = 2; used.has(slug); suffix++) slug = `${base}-${suffix}`;
    const { arms: armValues, ...campaign } = values;
    const [inserted] = await tx.insert(campaigns).values({ ...campaign, slug }).returning({ id: campaigns.id });
    await tx.insert(arms).values(
      armValues.map((arm, position) => ({
        campaignId: inserted.id,
        key: arm.key,
        name: arm.name,
        plannedShare: arm.share,
        isHoldout: arm.key === "holdout",
        position,
      })),
    );
    return (await getCampaign(values.workspaceId, inserted.id, tx))!;
  });
}

export type CampaignPatch = Partial<
  Pick<
    NewCampaignValues,
    "name" | "hypothesis" | "metricKind" | "metricName" | "metricUnit" | "baselineRate" | "baselineMean" | "baselineSd" | "minimumLift" | "alpha" | "power" | "sides" | "startDate" | "maxDays" | "dailyUnits" | "tau" | "plan"
  >
> & { status?: CampaignStatus; planChangedAt?: Date | SQL; countsChangedAt?: Date | SQL };

/** Updates a campaign's columns, and replaces its arms when given (inside the caller's transaction). */
export async function updateCampaign(
  tx: Transaction,
  workspaceId: string,
  campaignId: string,
  patch: CampaignPatch,
  newArms?: { key: string; name: string; share: number }[],
): Promise<void> {
  if (Object.keys(patch).length > 0) {
    await tx
      .update(campaigns)
      .set({ ...patch, updatedAt: new Date() })
      .where(and(eq(campaigns.workspaceId, workspaceId), eq(campaigns.id, campaignId)));
  }
  if (newArms) {
    const existing = await tx.select({ id: arms.id, key: arms.key }).from(arms).where(eq(arms.campaignId, campaignId));
    const keep = new Map(existing.map((arm) => [arm.key, arm.id]));
    for (const [position, arm] of newArms.entries()) {
      const id = keep.get(arm.key);
      if (id) {
        await tx.update(arms).set({ name: arm.name, plannedShare: arm.share, position, updatedAt: new Date() }).where(eq(arms.id, id));
        keep.delete(arm.key);
      } else {
        await tx.insert(arms).values({ campaignId, key: arm.key, name: arm.name, plannedShare: arm.share, isHoldout: arm.key === "holdout", position });
      }
    }
    const removed = [...keep.values()];
    if (removed.length > 0) await tx.delete(arms).where(and(eq(arms.campaignId, campaignId), inArray(arms.id, removed)));
  }
}

/** Locks the campaign row for the rest of the transaction and returns it (null when not in the workspace). */
export async function lockCampaign(tx: Transaction, workspaceId: string, campaignId: string): Promise<CampaignDto | null> {
  const [row] = await tx
    .select({ id: campaigns.id })
    .from(campaigns)
    .where(and(eq(campaigns.workspaceId, workspaceId), eq(campaigns.id, campaignId)))
    .for("update");
  if (!row) return null;
  return getCampaign(workspaceId, row.id, tx);
}

/** Whether any daily counts were stored for the campaign (the plan is locked from then on). */
export async function campaignHasCounts(campaignId: string, executor: Executor = getDb()): Promise<boolean> {
  const [row] = await executor.select({ id: dailyCounts.id }).from(dailyCounts).where(eq(dailyCounts.campaignId, campaignId)).limit(1);
  return row !== undefined;
}

/**
 * Locks the campaign rows for the rest of the transaction, in id order (so two writers never
 * deadlock). A recompute locks the same row before it reads its inputs, so the two serialize.
 */
export async function lockCampaignRows(tx: Transaction, campaignIds: string[]): Promise<void> {
  if (campaignIds.length === 0) return;
  await tx.select({ id: campaigns.id }).from(campaigns).where(inArray(campaigns.id, campaignIds)).orderBy(asc(campaigns.id)).for("update");
}

/**
 * Marks campaigns whose counts changed, for the worker to recompute. Stamped with the database's
 * `clock_timestamp()` (not the transaction's start, not the app's clock), the clock `analyzed_at`
 * uses: a recompute that committed before this write is always older than the mark.
 */
export async function markCampaignsForRecompute(tx: Transaction, campaignIds: string[]): Promise<void> {
  if (campaignIds.length === 0) return;
  await tx.update(campaigns).set({ countsChangedAt: sql`clock_timestamp()` }).where(inArray(campaigns.id, campaignIds));
}
