import { randomUUID } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { arms, campaigns, dailyCounts, organizations } from "@/db/schema";
import { bonferroniLevel, tauFromPlan } from "@/lib/sequential";

export interface WorkerArm {
  key: string;
  name: string;
  share: number;
}

export interface WorkerCampaignInput {
  workspaceId: string;
  createdBy: string | null;
  name?: string;
  metricKind?: "conversion" | "mean";
  baselineRate?: number;
  baselineMean?: number;
  baselineSd?: number;
  minimumLift?: number;
  alpha?: number;
  power?: number;
  sides?: 1 | 2;
  maxDays?: number;
  arms?: WorkerArm[];
}

export interface WorkerCampaign {
  id: string;
  name: string;
  input: Required<Omit<WorkerCampaignInput, "baselineRate" | "baselineMean" | "baselineSd" | "createdBy">> &
    Pick<WorkerCampaignInput, "baselineRate" | "baselineMean" | "baselineSd">;
  tau: number;
  armIds: Record<string, string>;
}

/**
 * A running campaign of Northwind Outfitters, inserted with Drizzle (τ from the plan as registration
 * derives it: first treatment arm at α/k); counts come with {@link putCounts}.
 */
export async function createWorkerCampaign(options: WorkerCampaignInput): Promise<WorkerCampaign> {
  const metricKind = options.metricKind ?? "conversion";
  const input = {
    workspaceId: options.workspaceId,
    name: options.name ?? `Trail shoe spring e-mail ${randomUUID().slice(0, 6)}`,
    metricKind,
    baselineRate: metricKind === "conversion" ? (options.baselineRate ?? 0.05) : undefined,
    baselineMean: metricKind === "mean" ? (options.baselineMean ?? 4.2) : undefined,
    baselineSd: metricKind === "mean" ? (options.baselineSd ?? 18) : undefined,
    minimumLift: options.minimumLift ?? 0.1,
    alpha: options.alpha ?? 0.05,
    power: options.power ?? 0.8,
    sides: options.sides ?? 2,
    maxDays: options.maxDays ?? 28,
    arms: options.arms ?? [
      { key: "holdout", name: "Holdout", share: 0.5 },
      { key: "treatment", name: "Spring e-mail", share: 0.5 },
    ],
  };
  const holdout = input.arms.find((arm) => arm.key === "holdout")!;
  const treatments = input.arms.filter((arm) => arm.key !== "holdout");
  const derived = tauFromPlan({
    metric: metricKind,
    baselineRate: metricKind === "conversion" ? input.baselineRate! : input.baselineMean!,
    standardDeviation: input.baselineSd,
    minimumLift: input.minimumLift,
    significanceLevel: bonferroniLevel(input.alpha, treatments.length),
    power: input.power,
    sides: input.sides,
    holdoutShare: holdout.share / (holdout.share + treatments[0].share),
  });
  const [row] = await getDb()
    .insert(campaigns)
    .values({
      workspaceId: input.workspaceId,
      name: input.name,
      slug: `${input.name.toLowerCase().replace(/[^a-z0-9]+/g, "-")}-${randomUUID().slice(0, 8)}`,
      metricKind,
      metricName: metricKind === "conversion" ? "First purchase" : "Order value per recipient",
      metricUnit: metricKind === "mean" ? "USD" : null,
      baselineRate: input.baselineRate ?? null,
      baselineMean: input.baselineMean ?? null,
      baselineSd: input.baselineSd ?? null,
      minimumLift: input.minimumLift,
      alpha: input.alpha,
      power: input.power,
      sides: input.sides,
      startDate: "2026-03-01",
      maxDays: input.maxDays,
      tau: derived.tau,
      plan: { perArm: { treatment: derived.sampleSize.treatment, holdout: derived.sampleSize.holdout }, total: derived.sampleSize.total, days: null },
      status: "running",
      createdBy: options.createdBy,
    })
    .returning({ id: campaigns.id });
  const inserted = await getDb()
    .insert(arms)
    .values(input.arms.map((arm, position) => ({ campaignId: row.id, key: arm.key, name: arm.name, plannedShare: arm.share, isHoldout: arm.key === "holdout", position })))
    .returning({ id: arms.id, key: arms.key });
  return {
    id: row.id,
    name: input.name,
    input: input as WorkerCampaign["input"],
    tau: derived.tau,
    armIds: Object.fromEntries(inserted.map((arm) => [arm.key, arm.id])),
  };
}

export interface CountInput {
  date: string;
  arm: string;
  n: number;
  sum: number;
  sumSq: number;
}

/** Writes (or replaces) daily counts and marks the campaign for recompute, as the ingest path does. */
export async function putCounts(campaign: WorkerCampaign, rows: CountInput[]): Promise<void> {
  if (rows.length === 0) return;
  await getDb()
    .insert(dailyCounts)
    .values(rows.map((row) => ({ campaignId: campaign.id, armId: campaign.armIds[row.arm], day: row.date, units: row.n, sum: row.sum, sumSquares: row.sumSq, source: "manual" as const })))
    .onConflictDoUpdate({
      target: [dailyCounts.armId, dailyCounts.day],
      set: { units: sql.raw(`excluded.${dailyCounts.units.name}`), sum: sql.raw(`excluded.${dailyCounts.sum.name}`), sumSquares: sql.raw(`excluded.${dailyCounts.sumSquares.name}`), revision: sql`${dailyCounts.revision} + 1` },
    });
  await getDb().update(campaigns).set({ countsChangedAt: sql`clock_timestamp()` }).where(eq(campaigns.id, campaign.id));
}

/** `YYYY-MM-DD` of March 2026, day `index` from 0. */
export function marchDay(index: number): string {
  return `2026-03-${String(index + 1).padStart(2, "0")}`;
}

/** Deterministic conversion counts: per day and arm, `units` and a conversion rate with a small daily wobble. */
export function conversionCounts(days: number, perArm: Record<string, { units: number; rate: number }>, firstDay = 0): CountInput[] {
  const rows: CountInput[] = [];
  for (let d = firstDay; d < firstDay + days; d++) {
    Object.entries(perArm).forEach(([arm, { units, rate }], index) => {
      const conversions = Math.round(units * rate) + ((d + index) % 3) - 1;
      rows.push({ date: marchDay(d), arm, n: units, sum: conversions, sumSq: conversions });
    });
  }
  return rows;
}

/** Deterministic mean-metric counts (order value): sum and sum of squares from a mean and a standard deviation per unit. */
export function meanCounts(days: number, perArm: Record<string, { units: number; mean: number; sd: number }>): CountInput[] {
  const rows: CountInput[] = [];
  for (let d = 0; d < days; d++) {
    Object.entries(perArm).forEach(([arm, { units, mean, sd }], index) => {
      const dayMean = mean * (1 + 0.02 * Math.sin(d + index));
      const sum = Math.round(units * dayMean * 100) / 100;
      const sumSq = Math.round((sd * sd * (units - 1) + (sum * sum) / units) * 100) / 100;
      rows.push({ date: marchDay(d), arm, n: units, sum, sumSq });
    });
  }
  return rows;
}

/** A bare workspace row (no members), for worker tests that need no signed-in user. */
export async function createBareWorkspace(name = "Northwind Outfitters"): Promise<string> {
  const id = randomUUID();
  await getDb().insert(organizations).values({ id, name, slug: `northwind-${id.slice(0, 8)}`, createdAt: new Date() });
  return id;
}
