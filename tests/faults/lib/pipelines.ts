import { randomUUID } from "node:crypto";
import { Agent, request } from "node:http";
import pg from "pg";
import { dayFromToday } from "../../../bench/lib/stack";

/** One ingest row as a pipeline sends it (conversion metric). */
export interface IngestRow {
  campaign: string;
  arm: "holdout" | "treatment";
  date: string;
  units: number;
  conversions: number;
}

/** One answer (or dropped connection) to one send of a batch. */
export interface Attempt {
  phase: string;
  status: number | null;
  latencyMs: number;
  /** The problem body of a non-200 answer, or the network error of a dropped connection. */
  problem?: unknown;
  error?: string;
}

export interface BatchRecord {
  pipeline: number;
  idempotencyKey: string;
  rows: IngestRow[];
  attempts: Attempt[];
  acknowledged: boolean;
}

/** A campaign a pipeline owns, whose days it fills batch after batch (each (arm, day) written once). */
export interface OwnedCampaign {
  id: string;
  days: number;
}

/**
 * Cuts the owned campaigns' days into batches of `daysPerBatch` days × 2 arms, in order, each row's
 * values derived from its position so every batch is distinct and checkable.
 */
export function batchSource(campaigns: OwnedCampaign[], daysPerBatch: number): () => IngestRow[] | null {
  let campaign = 0;
  let day = 0;
  return () => {
    while (campaign < campaigns.length && day + daysPerBatch > campaigns[campaign].days) {
      campaign += 1;
      day = 0;
    }
    if (campaign >= campaigns.length) return null;
    const owned = campaigns[campaign];
    const rows: IngestRow[] = [];
    for (let d = day; d < day + daysPerBatch; d++) {
      const date = dayFromToday(-owned.days + d);
      rows.push({ campaign: owned.id, arm: "holdout", date, units: 1_000 + (d % 13), conversions: 50 + (d % 7) });
      rows.push({ campaign: owned.id, arm: "treatment", date, units: 9_000 + (d % 17), conversions: 480 + (d % 11) });
    }
    day += daysPerBatch;
    return rows;
  };
}

const agent = new Agent({ keepAlive: true, maxSockets: 256 });

/** Sends one batch once; a dropped connection is an attempt with status null. */
export async function sendBatch(appUrl: string, apiKey: string, batch: BatchRecord, phase: string, timeoutMs = 30_000): Promise<Attempt> {
  const started = performance.now();
  let attempt: Attempt;
  try {
    const headers = { authorization: `Bearer ${apiKey}`, "idempotency-key": batch.idempotencyKey };
    const { status, text } = await postJson(new URL("/api/v1/ingest", appUrl), JSON.stringify({ rows: batch.rows }), headers, timeoutMs);
    attempt = { phase, status, latencyMs: performance.now() - started };
    if (status !== 200) attempt.problem = parseOrText(text);
  } catch (error) {
    attempt = { phase, status: null, latencyMs: performance.now() - started, error: `${(error as NodeJS.ErrnoException).code ?? ""} ${(error as Error).message}`.trim() };
  }
  batch.attempts.push(attempt);
  if (attempt.status === 200) batch.acknowledged = true;
  return attempt;
}

function parseOrText(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

/** POSTs JSON over the keep-alive agent; resolves with the status and body text. */
export function postJson(url: URL, body: string, headers: Record<string, string>, timeoutMs: number): Promise<{ status: number; text: string; contentType: string }> {
  return new Promise((resolve, reject) => {
    const req = request(
      url,
      { method: "POST", agent, headers: { ...headers, "content-type": "application/json", "content-length": Buffer.byteLength(body) }, timeout: timeoutMs },
      (res) => {
        let text = "";
        res.setEncoding("utf8");
        res.on("data", (chunk) => (text += chunk));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, text, contentType: String(res.headers["content-type"] ?? "") }));
        res.on("error", reject);
      },
    );
    req.on("timeout", () => req.destroy(new Error("timed out")));
    req.on("error", reject);
    req.end(body);
  });
}

/**
 * Runs one pipeline per key: each sends its next batch (a new Idempotency-Key), records the answer and
 * moves on, failed or not, until `until()` or its campaigns are full; `pauseMs` between batches.
 */
export async function runPipelines(options: {
  appUrl: string;
  keys: string[];
  sources: (() => IngestRow[] | null)[];
  until: () => boolean;
  phase: () => string;
  pauseMs?: number;
  records: BatchRecord[];
}): Promise<void> {
  await Promise.all(
    options.keys.map(async (key, pipeline) => {
      while (!options.until()) {
        const rows = options.sources[pipeline]();
        if (!rows) return;
        const batch: BatchRecord = { pipeline, idempotencyKey: randomUUID(), rows, attempts: [], acknowledged: false };
        options.records.push(batch);
        await sendBatch(options.appUrl, key, batch, options.phase());
        if (options.pauseMs) await new Promise((resolve) => setTimeout(resolve, options.pauseMs));
      }
    }),
  );
}

/** Resends every unacknowledged batch with its own Idempotency-Key until it is acknowledged (or `deadline`). */
export async function retryFailed(appUrl: string, keys: string[], records: BatchRecord[], deadline: number): Promise<void> {
  for (const batch of records) {
    while (!batch.acknowledged) {
      if (Date.now() > deadline) return;
      const attempt = await sendBatch(appUrl, keys[batch.pipeline], batch, "retry");
      if (attempt.status !== 200) await new Promise((resolve) => setTimeout(resolve, 250));
    }
  }
}

export interface StoredCheck {
  batches: number;
  acknowledged: number;
  rowsAcknowledged: number;
  rowsStored: number;
  /** Acknowledged rows missing from daily_counts or stored with other values. */
  rowsLost: number;
  /** Idempotency keys recorded more than once, revisions written, rows no batch sent. */
  duplicates: number;
  revisions: number;
  strayRows: number;
  samples: string[];
}

/**
 * Checks the database against what the pipelines were told: every acknowledged batch is recorded once
 * under its key and each of its rows is in daily_counts with exactly the sent values, nothing was
 * revised (each (arm, day) was sent by one batch) and no row is there that no batch sent.
 */
export async function checkStored(databaseUrl: string, records: BatchRecord[]): Promise<StoredCheck> {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  try {
    const campaignIds = [...new Set(records.flatMap((batch) => batch.rows.map((row) => row.campaign)))];
    const { rows: stored } = await pool.query<{ campaign_id: string; arm: string; day: string; units: number; sum: number; sum_squares: number; revision: number }>(
      `select c.campaign_id, a.key as arm, to_char(c.day, 'YYYY-MM-DD') as day, c.units, c.sum, c.sum_squares, c.revision
         from daily_counts c join arms a on a.id = c.arm_id where c.campaign_id = any($1)`,
      [campaignIds],
    );
    const byKey = new Map(stored.map((row) => [`${row.campaign_id}|${row.arm}|${row.day}`, row]));
    const { rows: keyCounts } = await pool.query<{ idempotency_key: string; n: number }>(
      "select idempotency_key, count(*)::int as n from ingest_batches where idempotency_key = any($1) group by idempotency_key",
      [records.map((batch) => batch.idempotencyKey)],
    );
    const { rows: revisionRows } = await pool.query<{ n: number }>("select count(*)::int as n from daily_count_revisions where campaign_id = any($1)", [campaignIds]);
    const recorded = new Map(keyCounts.map((row) => [row.idempotency_key, row.n]));
    const samples: string[] = [];
    let rowsAcknowledged = 0;
    let rowsLost = 0;
    let duplicates = 0;
    const sent = new Set<string>();
    for (const batch of records) {
      const times = recorded.get(batch.idempotencyKey) ?? 0;
      if (times > 1) {
        duplicates += times - 1;
        samples.push(`batch ${batch.idempotencyKey} recorded ${times} times`);
      }
      for (const row of batch.rows) sent.add(`${row.campaign}|${row.arm}|${row.date}`);
      if (!batch.acknowledged) continue;
      if (times === 0) samples.push(`acknowledged batch ${batch.idempotencyKey} has no ingest_batches row`);
      for (const row of batch.rows) {
        rowsAcknowledged += 1;
        const found = byKey.get(`${row.campaign}|${row.arm}|${row.date}`);
        if (!found || found.units !== row.units || found.sum !== row.conversions || found.sum_squares !== row.conversions) {
          rowsLost += 1;
          if (samples.length < 10) samples.push(`row ${row.campaign} ${row.arm} ${row.date}: sent ${row.units}/${row.conversions}, stored ${found ? `${found.units}/${found.sum}` : "nothing"}`);
        } else if (found.revision !== 0) {
          duplicates += 1;
          if (samples.length < 10) samples.push(`row ${row.campaign} ${row.arm} ${row.date} at revision ${found.revision}`);
        }
      }
    }
    const strayRows = stored.filter((row) => !sent.has(`${row.campaign_id}|${row.arm}|${row.day}`)).length;
    return {
      batches: records.length,
      acknowledged: records.filter((batch) => batch.acknowledged).length,
      rowsAcknowledged,
      rowsStored: stored.length,
      rowsLost,
      duplicates,
      revisions: revisionRows[0].n,
      strayRows,
      samples,
    };
  } finally {
    await pool.end();
  }
}

/** An RFC 9457 problem body with no stack trace or driver message in it. */
export function isCleanProblem(problem: unknown): boolean {
  if (!problem || typeof problem !== "object") return false;
  const body = problem as Record<string, unknown>;
  const text = JSON.stringify(problem);
  return (
    typeof body.type === "string" &&
    typeof body.title === "string" &&
    typeof body.status === "number" &&
    typeof body.detail === "string" &&
    !/\n\s+at |node_modules|ECONNREFUSED|terminating connection|\.ts:\d+/.test(text)
  );
}

/** Percentile of `values` (nearest rank), 0 when empty. */
export function percentile(values: number[], p: number): number {
  if (values.length === 0) return 0;
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1))];
}

/** Launches registered campaigns (a draft until launched), directly in the database as the benches do. */
export async function launchCampaigns(databaseUrl: string, campaignIds: string[]): Promise<void> {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  try {
    await pool.query("update campaigns set status = 'running' where id = any($1)", [campaignIds]);
  } finally {
    await pool.end();
  }
}
