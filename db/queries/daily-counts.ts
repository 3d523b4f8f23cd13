import { asc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { arms, dailyCounts } from "@/db/schema";
import { dayNumber } from "@/lib/sequential/day-number";
import type { Executor, Transaction } from "./campaigns";

/** The part of a stored count the cumulative check reads. */
export interface StoredTotal {
  armId: string;
  day: string;
  units: number;
  sum: number;
}

/**
 * Units and sums of every stored day of the given arms. No row locks: every writer of an arm's counts
 * holds its campaign's advisory lock and row lock first (lib/ingest/ingest-batch.ts).
 */
export async function listStoredTotals(tx: Transaction, armIds: string[]): Promise<StoredTotal[]> {
  if (armIds.length === 0) return [];
  const result = await tx.execute<{ armId: string; day: string; units: number; sum: number }>(
    sql`select arm_id as "armId", day::text as day, units, sum from daily_counts where arm_id = any(${sql.param(armIds)}::uuid[])`,
  );
  return result.rows;
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

export interface CountBatch {
  id: string;
  workspaceId: string;
  apiKeyId: string | null;
  userId: string | null;
  source: "api" | "csv";
  idempotencyKey: string;
  requestHash: string;
}

export interface CountBatchTally {
  accepted: number;
  replaced: number;
  unchanged: number;
  /** Campaigns with at least one new or replaced count. */
  changedCampaignIds: string[];
}

/**
 * Stores a validated batch in one statement: keeps the stored values a row is about to replace as
 * revisions, inserts new (arm, day) counts and replaces changed ones (revision raised), leaves equal
 * ones alone, and records the batch with its answer. Each (arm, day) appears at most once in `rows`.
 */
export async function storeCountBatch(tx: Transaction, batch: CountBatch, rows: CountWrite[]): Promise<CountBatchTally> {
  const parameters = compactRows(rows);
  const result = await tx.execute<{ accepted: number; replaced: number; changedCampaignIds: string[] | null }>(sql`
    with input as (
      select (${sql.param(parameters.campaignIds)}::uuid[])[input.arm] as campaign_id, (${sql.param(parameters.armIds)}::uuid[])[input.arm] as arm_id,
        ${parameters.firstDay}::date + input.day as day, input.units, input.sum, input.sum_squares
      from unnest(${sql.param(parameters.arm)}::integer[], ${sql.param(parameters.day)}::integer[], ${sql.param(parameters.units)}::integer[],
        ${sql.param(parameters.sum)}::float8[], ${sql.param(parameters.sumSquares)}::float8[]) as input (arm, day, units, sum, sum_squares)
    ),
    revisions as (
      insert into daily_count_revisions (daily_count_id, campaign_id, arm_id, day, revision, units, sum, sum_squares, source, batch_id, replaced_by_batch_id)
      select stored.id, stored.campaign_id, stored.arm_id, stored.day, stored.revision, stored.units, stored.sum, stored.sum_squares, stored.source, stored.batch_id, ${batch.id}::uuid
      from input join daily_counts stored on stored.arm_id = input.arm_id and stored.day = input.day
      where (stored.units, stored.sum, stored.sum_squares) is distinct from (input.units, input.sum, input.sum_squares)
    ),
    written as (
      insert into daily_counts as stored (campaign_id, arm_id, day, units, sum, sum_squares, source, batch_id)
      select campaign_id, arm_id, day, units, sum, sum_squares, ${batch.source}, ${batch.id}::uuid from input
      on conflict (arm_id, day) do update set
        units = excluded.units, sum = excluded.sum, sum_squares = excluded.sum_squares, source = excluded.source,
        batch_id = excluded.batch_id, revision = stored.revision + 1, updated_at = now()
        where (stored.units, stored.sum, stored.sum_squares) is distinct from (excluded.units, excluded.sum, excluded.sum_squares)
      returning stored.campaign_id, stored.xmax = 0 as inserted
    ),
    tally as (
      select count(*) filter (where inserted)::integer as accepted, count(*) filter (where not inserted)::integer as replaced,
        array_agg(distinct campaign_id::text) as changed_campaign_ids
      from written
    ),
    -- The daily_counts foreign keys to this row are checked at the end of the statement, when it exists.
    recorded as (
      insert into ingest_batches (id, workspace_id, api_key_id, user_id, source, idempotency_key, request_hash, row_count,
        accepted, replaced, unchanged, outcome, response_status, response_body)
      select ${batch.id}::uuid, ${batch.workspaceId}, ${batch.apiKeyId}, ${batch.userId}, ${batch.source}, ${batch.idempotencyKey}, ${batch.requestHash}, ${rows.length},
        accepted, replaced, ${rows.length} - accepted - replaced, 'accepted', 200,
        jsonb_build_object('batchId', ${batch.id}::text, 'accepted', accepted, 'replaced', replaced, 'unchanged', ${rows.length} - accepted - replaced)
      from tally
    )
    select accepted, replaced, changed_campaign_ids as "changedCampaignIds" from tally
  `);
  const [tally] = result.rows;
  return { accepted: tally.accepted, replaced: tally.replaced, unchanged: rows.length - tally.accepted - tally.replaced, changedCampaignIds: tally.changedCampaignIds ?? [] };
}

/**
 * The rows as short parameters: each arm's ids once and a 1-based position per row, each day as days
 * after the batch's first day. Uuid and date arrays of every row were most of the bytes sent and parsed.
 */
function compactRows(rows: CountWrite[]) {
  const positions = new Map<string, number>();
  const armIds: string[] = [];
  const campaignIds: string[] = [];
  let firstDay = rows[0]?.day ?? "1970-01-01";
  for (const row of rows) if (row.day < firstDay) firstDay = row.day;
  const first = dayNumber(firstDay)!;
  const arm: number[] = [];
  const day: number[] = [];
  for (const row of rows) {
    let position = positions.get(row.armId);
    if (position === undefined) {
      position = armIds.push(row.armId);
      campaignIds.push(row.campaignId);
      positions.set(row.armId, position);
    }
    arm.push(position);
    day.push(dayNumber(row.day)! - first);
  }
  return { armIds, campaignIds, firstDay, arm, day, units: rows.map((row) => row.units), sum: rows.map((row) => row.sum), sumSquares: rows.map((row) => row.sumSquares) };
}
