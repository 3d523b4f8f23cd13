import { asc, eq, inArray, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { arms, dailyCountRevisions, dailyCounts } from "@/db/schema";
import type { Executor, Transaction } from "./campaigns";

export interface StoredCount {
  id: string;
  armId: string;
  day: string;
  units: number;
  sum: number;
  sumSquares: number;
  source: "api" | "csv" | "manual" | "seed";
  batchId: string | null;
  revision: number;
}

const countColumns = {
  id: dailyCounts.id,
  armId: dailyCounts.armId,
  day: dailyCounts.day,
  units: dailyCounts.units,
  sum: dailyCounts.sum,
  sumSquares: dailyCounts.sumSquares,
  source: dailyCounts.source,
  batchId: dailyCounts.batchId,
  revision: dailyCounts.revision,
};

/** Every stored count of the given arms, locked for the caller's transaction, by arm and day. */
export async function lockCountsOfArms(tx: Transaction, armIds: string[]): Promise<StoredCount[]> {
  if (armIds.length === 0) return [];
  return tx.select(countColumns).from(dailyCounts).where(inArray(dailyCounts.armId, armIds)).orderBy(asc(dailyCounts.armId), asc(dailyCounts.day)).for("update");
}

/** A campaign's daily counts with their arm keys, by day then arm position (the campaign is already scoped). */
export async function listDailyCounts(campaignId: string, executor: Executor = getDb()) {
  return executor
    .select({ day: dailyCounts.day, arm: arms.key, units: dailyCounts.units, sum: dailyCounts.sum, sumSquares: dailyCounts.sumSquares, source: dailyCounts.source, revision: dailyCounts.revision, updatedAt: dailyCounts.updatedAt })
    .from(dailyCounts)
    .innerJoin(arms, eq(arms.id, dailyCounts.armId))
    .where(eq(dailyCounts.campaignId, campaignId))
    .orderBy(asc(dailyCounts.day), asc(arms.position));
}

export interface CountWrite {
  campaignId: string;
  armId: string;
  day: string;
  units: number;
  sum: number;
  sumSquares: number;
}

const CHUNK = 1_000;

/** Keeps the values a batch is about to replace, so nothing acknowledged is lost. */
export async function createCountRevisions(tx: Transaction, replaced: { old: StoredCount; campaignId: string }[], replacedByBatchId: string): Promise<void> {
  for (let start = 0; start < replaced.length; start += CHUNK) {
    await tx.insert(dailyCountRevisions).values(
      replaced.slice(start, start + CHUNK).map(({ old, campaignId }) => ({
        dailyCountId: old.id,
        campaignId,
        armId: old.armId,
        day: old.day,
        revision: old.revision,
        units: old.units,
        sum: old.sum,
        sumSquares: old.sumSquares,
        source: old.source,
        batchId: old.batchId,
        replacedByBatchId,
      })),
    );
  }
}

const excluded = (column: { name: string }) => sql.raw(`excluded."${column.name}"`);

/**
 * Inserts new (arm, day) counts and replaces changed ones in one statement per chunk; a row equal to the
 * stored one is left alone (the WHERE of the upsert), a replaced one gets its revision number raised.
 */
export async function upsertDailyCounts(tx: Transaction, rows: CountWrite[], source: "api" | "csv", batchId: string): Promise<void> {
  for (let start = 0; start < rows.length; start += CHUNK) {
    await tx
      .insert(dailyCounts)
      .values(
        rows.slice(start, start + CHUNK).map((row) => ({
          campaignId: row.campaignId,
          armId: row.armId,
          day: row.day,
          units: row.units,
          sum: row.sum,
          sumSquares: row.sumSquares,
          source,
          batchId,
        })),
      )
      .onConflictDoUpdate({
        target: [dailyCounts.armId, dailyCounts.day],
        set: {
          units: excluded(dailyCounts.units),
          sum: excluded(dailyCounts.sum),
          sumSquares: excluded(dailyCounts.sumSquares),
          source: excluded(dailyCounts.source),
          batchId: excluded(dailyCounts.batchId),
          revision: sql`${dailyCounts.revision} + 1`,
          updatedAt: sql`now()`,
        },
        setWhere: sql`(${dailyCounts.units}, ${dailyCounts.sum}, ${dailyCounts.sumSquares}) is distinct from (${excluded(dailyCounts.units)}, ${excluded(dailyCounts.sum)}, ${excluded(dailyCounts.sumSquares)})`,
      });
  }
}
