import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { asc, inArray } from "drizzle-orm";
import type { PoolClient } from "pg";
import { from as copyFrom } from "pg-copy-streams";
import { arms, campaigns } from "@/db/schema";
import type { CallName } from "@/db/schema";
import type { AnalysisInputs, Transaction } from "./analysis";

/** One analysis day as the columns of `analysis_days` (health and detail already JSON text). */
export interface AnalysisDayColumns {
  campaignId: string;
  day: string;
  daysRun: number;
  call: CallName;
  /** lift_absolute … peeking_cost in table order; null for SQL null. */
  numbers: readonly (number | null)[];
  healthJson: string;
  detailJson: string;
  inputsHash: string;
}

/** The numeric columns of `analysis_days`, in the order of {@link AnalysisDayColumns.numbers}. */
export const ANALYSIS_NUMBER_COLUMNS = [
  "lift_absolute",
  "lift_relative",
  "sequence_low",
  "sequence_high",
  "interval_low",
  "interval_high",
  "fixed_z",
  "fixed_p",
  "sequential_p",
  "srm_p",
  "srm_sequential_p",
  "peeking_cost",
] as const;

/**
 * Locks the campaign rows for this transaction (`for update`, in id order so two groups never wait
 * on each other in a cycle) and reads the plans, arms and daily counts of many campaigns at once.
 * The map has no entry for a campaign that does not exist.
 */
export async function lockAnalysisInputsBatch(tx: Transaction, client: PoolClient, campaignIds: string[]): Promise<Map<string, AnalysisInputs>> {
  const found = new Map<string, AnalysisInputs>();
  if (campaignIds.length === 0) return found;
  const campaignRows = await tx
    .select({
      id: campaigns.id,
      workspaceId: campaigns.workspaceId,
      name: campaigns.name,
      status: campaigns.status,
      metricKind: campaigns.metricKind,
      metricName: campaigns.metricName,
      metricUnit: campaigns.metricUnit,
      alpha: campaigns.alpha,
      power: campaigns.power,
      sides: campaigns.sides,
      baselineRate: campaigns.baselineRate,
      baselineMean: campaigns.baselineMean,
      baselineSd: campaigns.baselineSd,
      minimumLift: campaigns.minimumLift,
      tau: campaigns.tau,
      maxDays: campaigns.maxDays,
      currentCall: campaigns.currentCall,
      analysisInputsHash: campaigns.analysisInputsHash,
    })
    .from(campaigns)
    .where(inArray(campaigns.id, campaignIds))
    .orderBy(asc(campaigns.id))
    .for("update");
  for (const campaign of campaignRows) found.set(campaign.id, { campaign, arms: [], rows: [] });
  const armRows = await tx
    .select({ campaignId: arms.campaignId, key: arms.key, name: arms.name, plannedShare: arms.plannedShare, position: arms.position })
    .from(arms)
    .where(inArray(arms.campaignId, campaignIds))
    .orderBy(asc(arms.campaignId), asc(arms.position), asc(arms.key));
  for (const { campaignId, ...arm } of armRows) found.get(campaignId)?.arms.push(arm);
  // Array rows and the driver's own int4/float8 parsers: no per-row objects from an ORM.
  const counts = await client.query<[string, string, string, number, number, number]>({
    text: `select dc.campaign_id, dc.day::text, a.key, dc.units, dc.sum, dc.sum_squares
           from daily_counts dc join arms a on a.id = dc.arm_id
           where dc.campaign_id = any($1::uuid[])
           order by dc.campaign_id, dc.day, a.key`,
    values: [campaignIds],
    rowMode: "array",
  });
  let current: AnalysisInputs | undefined;
  let currentId = "";
  for (const [campaignId, date, arm, n, sum, sumSq] of counts.rows) {
    if (campaignId !== currentId) {
      currentId = campaignId;
      current = found.get(campaignId);
    }
    current?.rows.push({ date, arm, n, sum, sumSq });
  }
  return found;
}

/** Spare buffers of finished groups, so a pass reuses a few instead of leaving one per campaign to the collector. */
const spareBuffers: Buffer[] = [];
const SPARE_BUFFERS = 4;

/**
 * A group's COPY text for {@link replaceAnalysisDaysBatch}, encoded line by line into one buffer
 * taken from a small pool: no per-campaign string or Buffer lives until the COPY. Call `release`
 * once the COPY has finished (never while it may still be writing).
 */
export class AnalysisDaysCopyText {
  private buffer: Buffer = spareBuffers.pop() ?? Buffer.allocUnsafeSlow(1 << 20);
  private length = 0;

  /** Appends the COPY lines of these analysis days. */
  append(days: readonly AnalysisDayColumns[]): void {
    for (const day of days) {
      const line = analysisDayLine(day);
      // UTF-8 needs at most 3 bytes per UTF-16 code unit.
      if (this.length + 3 * line.length > this.buffer.length) {
        const grown = Buffer.allocUnsafeSlow(Math.max(2 * this.buffer.length, this.length + 3 * line.length));
        this.buffer.copy(grown, 0, 0, this.length);
        this.buffer = grown;
      }
      this.length += this.buffer.write(line, this.length, "utf8");
    }
  }

  /** The text so far (a view of the pooled buffer, valid until `release`). */
  chunks(): Buffer[] {
    return this.length === 0 ? [] : [this.buffer.subarray(0, this.length)];
  }

  /** Gives the buffer back to the pool; the text must not be used afterwards. */
  release(): void {
    if (spareBuffers.length < SPARE_BUFFERS) spareBuffers.push(this.buffer);
    this.length = 0;
  }
}

function analysisDayLine(day: AnalysisDayColumns): string {
  let line = `${day.campaignId}\t${day.day}\t${day.daysRun}\t${day.call}`;
  for (const value of day.numbers) line += value === null || value === undefined ? "\t\\N" : `\t${value}`;
  return `${line}\t${copyText(day.healthJson)}\t${copyText(day.detailJson)}\t${day.inputsHash}\n`;
}

/**
 * Replaces every analysis day of the given campaigns (inside the recompute transaction): one
 * delete and one COPY of their {@link AnalysisDaysCopyText} for the whole group.
 */
export async function replaceAnalysisDaysBatch(client: PoolClient, campaignIds: string[], chunks: readonly Buffer[]): Promise<void> {
  if (campaignIds.length === 0) return;
  await client.query("delete from analysis_days where campaign_id = any($1::uuid[])", [campaignIds]);
  if (chunks.length === 0) return;
  const columns = ["campaign_id", "day", "days_run", "call", ...ANALYSIS_NUMBER_COLUMNS, "health", "detail", "inputs_hash"];
  await pipeline(Readable.from(chunks), client.query(copyFrom(`copy analysis_days (${columns.join(", ")}) from stdin`)));
}

/** Records each campaign's current call and inputs hash, and stamps analyzed_at, in one statement. */
export async function markCampaignsAnalyzed(client: PoolClient, values: readonly { campaignId: string; call: CallName; inputsHash: string }[]): Promise<void> {
  if (values.length === 0) return;
  await client.query(
    `update campaigns as c
        set current_call = v.call, analysis_inputs_hash = v.inputs_hash, analyzed_at = clock_timestamp(), updated_at = clock_timestamp()
       from unnest($1::uuid[], $2::text[], $3::text[]) as v(id, call, inputs_hash)
      where c.id = v.id`,
    [values.map((value) => value.campaignId), values.map((value) => value.call), values.map((value) => value.inputsHash)],
  );
}

/** Notes that the campaigns' inputs were checked and found unchanged (skipped recomputes). */
export async function touchCampaignsAnalyzed(client: PoolClient, campaignIds: string[]): Promise<void> {
  if (campaignIds.length === 0) return;
  await client.query("update campaigns set analyzed_at = clock_timestamp(), updated_at = clock_timestamp() where id = any($1::uuid[])", [campaignIds]);
}

const COPY_SPECIAL = /[\\\n\r\t]/;

/** Escapes a value for COPY text format (backslash, newline, carriage return, tab). */
function copyText(value: string): string {
  if (!COPY_SPECIAL.test(value)) return value;
  return value.replace(/[\\\n\r\t]/g, (character) => (character === "\\" ? "\\\\" : character === "\n" ? "\\n" : character === "\r" ? "\\r" : "\\t"));
}
