import { createHash, randomUUID } from "node:crypto";
import { and, eq, inArray, or, sql } from "drizzle-orm";
import { getDb } from "@/db";
import { listArmsOfCampaigns } from "@/db/queries/arms";
import { lockCampaignRows, markCampaignsForRecompute, type Transaction } from "@/db/queries/campaigns";
import { listStoredTotals, storeCountBatch, type CountWrite, type StoredTotal } from "@/db/queries/daily-counts";
import { getIngestBatch } from "@/db/queries/ingest-batches";
import { campaigns, organizations } from "@/db/schema";
import { ConflictError, ValidationError, type FieldProblem } from "@/lib/errors";
import type { IngestResult, IngestRow } from "@/lib/validation/ingest";
import { UUID_PATTERN } from "@/lib/validation/campaigns";
import { getEnv } from "@/lib/env";
import { todayIn } from "./today-in";
import { WriteGate } from "./write-gate";

export interface IngestRequest {
  workspaceId: string;
  apiKeyId?: string | null;
  userId?: string | null;
  source: "api" | "csv";
  idempotencyKey: string;
  /** Rows already parsed by `ingestBatchSchema`. */
  rows: IngestRow[];
}

export interface IngestOutcome {
  status: number;
  body: IngestResult;
  /** True when this is the stored answer of an earlier request with the same key. */
  replayed: boolean;
}

/** SHA-256 of the parsed rows: the same key with another body is a conflict, whatever the whitespace. */
export function requestHash(source: string, rows: IngestRow[]): string {
  return createHash("sha256").update(source).update("\n").update(JSON.stringify(rows)).digest("hex");
}

function lockKey(value: string) {
  return sql`pg_advisory_xact_lock(hashtextextended(${value}, 0))`;
}

interface CampaignRef {
  id: string;
  slug: string;
  status: string;
  metricKind: "conversion" | "mean";
  startDate: string;
}

/**
 * Stores one batch of daily counts, all or nothing: validates every row against the workspace's
 * campaigns (throws ValidationError naming every bad row), replaces changed (arm, day) counts keeping
 * the old values as revisions, leaves identical ones alone, records the batch under its idempotency
 * key and marks the campaigns for recompute — in one transaction. Concurrent batches on a campaign
 * serialize on an advisory lock, and with the recompute on the campaign rows (locked in id order); a replay of a key returns the first answer, another body under the
 * same key throws ConflictError.
 */
export async function ingestBatch(request: IngestRequest): Promise<IngestOutcome> {
  const hash = requestHash(request.source, request.rows);
  return writeGate().run(() => storeBatch(request, hash));
}

let gate: WriteGate | undefined;

function writeGate(): WriteGate {
  gate ??= new WriteGate({ concurrency: getEnv().INGEST_CONCURRENCY, maxQueued: 200, maxWaitMs: 30_000 });
  return gate;
}

async function storeBatch(request: IngestRequest, hash: string): Promise<IngestOutcome> {
  return getDb().transaction(async (tx) => {
    await tx.execute(sql`select ${lockKey(`ingest:${request.workspaceId}:${request.idempotencyKey}`)}`);
    const earlier = await getIngestBatch(tx, request.workspaceId, request.idempotencyKey);
    if (earlier) {
      if (earlier.requestHash !== hash) {
        throw new ConflictError("This Idempotency-Key was used for a different request body; send a new key for new data.");
      }
      return { status: earlier.responseStatus, body: earlier.responseBody as IngestResult, replayed: true };
    }

    const references = [...new Set(request.rows.map((row) => row.campaign))];
    const found = await resolveCampaigns(tx, request.workspaceId, references);
    const campaignIds = [...new Set([...found.values()].map((campaign) => campaign.id))].sort();
    for (const id of campaignIds) await tx.execute(sql`select ${lockKey(`campaign:${id}`)}`);
    // Row locks too: a recompute holds the row while it reads the counts, so it sees this batch whole or not at all.
    await lockCampaignRows(tx, campaignIds);
    const fresh = await resolveCampaigns(tx, request.workspaceId, references);
    const timeZone = await workspaceTimeZone(tx, request.workspaceId);
    const today = todayIn(timeZone);
    const armRows = await listArmsOfCampaigns(tx, campaignIds);
    const armIds = new Map(armRows.map((arm) => [`${arm.campaignId}|${arm.key}`, arm.id]));

    const errors: FieldProblem[] = [];
    const writes: (CountWrite & { index: number })[] = [];
    const seen = new Map<string, number>();
    request.rows.forEach((row, index) => {
      const problem = (field: string, message: string) => errors.push({ row: index, pointer: `/rows/${index}/${field}`, message });
      const campaign = fresh.get(row.campaign);
      if (!campaign) return problem("campaign", `No campaign "${row.campaign}" in this workspace`);
      if (campaign.status === "archived") return problem("campaign", `Campaign "${campaign.slug}" is archived and takes no more counts`);
      const armId = armIds.get(`${campaign.id}|${row.arm}`);
      if (!armId) return problem("arm", `Campaign "${campaign.slug}" has no arm "${row.arm}"`);
      if (campaign.metricKind === "conversion" && row.conversions === undefined) {
        return problem("conversions", `Campaign "${campaign.slug}" measures conversions: send units and conversions`);
      }
      if (campaign.metricKind === "mean" && row.conversions !== undefined) {
        return problem("conversions", `Campaign "${campaign.slug}" measures a mean: send units, sum and sumSquares`);
      }
      if (row.date < campaign.startDate) return problem("date", `${row.date} is before the campaign's start on ${campaign.startDate}`);
      if (row.date > today) return problem("date", `${row.date} is in the future (today is ${today} in ${timeZone})`);
      const key = `${armId}|${row.date}`;
      const first = seen.get(key);
      if (first !== undefined) return problem("date", `Arm "${row.arm}" on ${row.date} repeats row ${first}`);
      seen.set(key, index);
      const sum = row.conversions ?? row.sum!;
      const sumSquares = row.conversions ?? row.sumSquares!;
      writes.push({ index, campaignId: campaign.id, armId, day: row.date, units: row.units, sum, sumSquares });
    });
    if (errors.length > 0) throw new ValidationError(rejection(errors.length), errors);

    const conversionCampaigns = new Set([...fresh.values()].filter((campaign) => campaign.metricKind === "conversion").map((campaign) => campaign.id));
    const conversionWrites = writes.filter((write) => conversionCampaigns.has(write.campaignId));
    const stored = await listStoredTotals(tx, [...new Set(conversionWrites.map((write) => write.armId))]);
    errors.push(...cumulativeProblems(stored, conversionWrites));
    if (errors.length > 0) throw new ValidationError(rejection(errors.length), errors);

    const batchId = randomUUID();
    const tally = await storeCountBatch(
      tx,
      { id: batchId, workspaceId: request.workspaceId, apiKeyId: request.apiKeyId ?? null, userId: request.userId ?? null, source: request.source, idempotencyKey: request.idempotencyKey, requestHash: hash },
      writes,
    );
    const body: IngestResult = { batchId, accepted: tally.accepted, replaced: tally.replaced, unchanged: tally.unchanged };
    await markCampaignsForRecompute(tx, tally.changedCampaignIds);
    return { status: 200, body, replayed: false };
  });
}

function rejection(count: number): string {
  return `${count} ${count === 1 ? "row was" : "rows were"} refused; nothing from this batch was stored.`;
}

async function resolveCampaigns(tx: Transaction, workspaceId: string, references: string[]): Promise<Map<string, CampaignRef>> {
  const ids = references.filter((reference) => UUID_PATTERN.test(reference)).map((reference) => reference.toLowerCase());
  const slugs = references.filter((reference) => !UUID_PATTERN.test(reference));
  const rows = await tx
    .select({ id: campaigns.id, slug: campaigns.slug, status: campaigns.status, metricKind: campaigns.metricKind, startDate: campaigns.startDate })
    .from(campaigns)
    .where(
      and(
        eq(campaigns.workspaceId, workspaceId),
        or(ids.length > 0 ? inArray(campaigns.id, ids) : undefined, slugs.length > 0 ? inArray(campaigns.slug, slugs) : undefined),
      ),
    );
  const byReference = new Map<string, CampaignRef>();
  for (const reference of references) {
    const match = rows.find((row) => (UUID_PATTERN.test(reference) ? row.id === reference.toLowerCase() : row.slug === reference));
    if (match) byReference.set(reference, match);
  }
  return byReference;
}

async function workspaceTimeZone(tx: Transaction, workspaceId: string): Promise<string> {
  const [row] = await tx.select({ timeZone: organizations.timeZone }).from(organizations).where(eq(organizations.id, workspaceId)).limit(1);
  return row?.timeZone || "UTC";
}

/**
 * Conversions may arrive a day late, so the rule is on the cumulative totals: after the batch, no
 * day of an arm may have more conversions so far than units so far. The blamed row is the batch's
 * last row of that arm on or before the first day that breaks it.
 */
function cumulativeProblems(stored: StoredTotal[], writes: (CountWrite & { index: number })[]): FieldProblem[] {
  const byArm = new Map<string, Map<string, { units: number; sum: number; index?: number }>>();
  for (const count of stored) {
    const days = byArm.get(count.armId) ?? new Map();
    days.set(count.day, { units: count.units, sum: count.sum });
    byArm.set(count.armId, days);
  }
  const touched = new Set<string>();
  for (const write of writes) {
    const days = byArm.get(write.armId) ?? new Map();
    days.set(write.day, { units: write.units, sum: write.sum, index: write.index });
    byArm.set(write.armId, days);
    touched.add(write.armId);
  }
  const problems: FieldProblem[] = [];
  for (const armId of touched) {
    const days = [...byArm.get(armId)!.entries()].sort(([a], [b]) => (a < b ? -1 : 1));
    let units = 0;
    let conversions = 0;
    let blame: number | undefined;
    for (const [day, value] of days) {
      units += value.units;
      conversions += value.sum;
      if (value.index !== undefined) blame = value.index;
      if (conversions > units) {
        const index = blame ?? days.find(([, later]) => later.index !== undefined)![1].index!;
        problems.push({
          row: index,
          pointer: `/rows/${index}/conversions`,
          message: `Conversions would exceed units in the cumulative totals on ${day} (${conversions} > ${units})`,
        });
        break;
      }
    }
  }
  return problems.sort((a, b) => a.row! - b.row!);
}
