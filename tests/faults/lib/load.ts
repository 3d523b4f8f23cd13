import { randomUUID } from "node:crypto";
import autocannon from "autocannon";
import pg from "pg";
import { createBenchCampaign, dayFromToday, type BenchWorkspace } from "../../../bench/lib/stack";
import { percentile, postJson, type IngestRow } from "./pipelines";

// The parts of autocannon's options and result used here (bench/lib/modules.d.ts declares fewer).
interface PollOptions {
  url: string;
  connections: number;
  duration: number;
  headers: Record<string, string>;
  requests: { method: string; setupRequest: (request: { path: string }) => { path: string } }[];
}
interface PollResult {
  requests: { total: number };
  latency: { p50: number; p99: number; max: number };
  duration: number;
  errors: number;
  timeouts: number;
  statusCodeStats?: Record<string, { count: number }>;
}
const poll = autocannon as unknown as (options: PollOptions) => Promise<PollResult>;

export interface LoadOptions {
  appUrl: string;
  databaseUrl: string;
  workspace: BenchWorkspace;
  /** One pipeline per key in `workspace.keys`. */
  pipelines: number;
  /** Rows per batch: 2 arms × up to 250 days of each campaign the pipeline owns (1,000 rows: two campaigns). */
  batchRows: number;
  pollers: number;
  seconds: number;
  log?: (message: string) => void;
}

export interface LoadResult {
  seconds: number;
  pipelines: number;
  batchRows: number;
  pollers: number;
  batches: { sent: number; acknowledged: number; perSecond: number; rowsPerSecond: number; latencyMs: { p50: number; p99: number; max: number }; errorsByStatus: Record<string, number> };
  polls: { sent: number; perSecond: number; latencyMs: { p50: number; p99: number; max: number }; errorsByStatus: Record<string, number> };
  rows: { acknowledged: number; inDatabase: number; lost: number; wrongValues: number };
  errors: number;
}

/** A pipeline's batch number `sequence`: the same (arm, day) cells of its campaigns, new values each time. */
function batchRows(campaignIds: string[], days: number, sequence: number): IngestRow[] {
  const rows: IngestRow[] = [];
  for (const campaignId of campaignIds) for (let d = 0; d < days; d++) {
    const date = dayFromToday(-days + d);
    rows.push({ campaign: campaignId, arm: "holdout", date, units: 1_000 + sequence, conversions: 50 + ((sequence + d) % 7) });
    rows.push({ campaign: campaignId, arm: "treatment", date, units: 9_000 + sequence, conversions: 480 + ((sequence + d) % 11) });
  }
  return rows;
}

/**
 * Pipelines push distinct batches (each pipeline re-sends its own campaign's days with new values, so
 * every acknowledged row ends up either as the stored count or as one kept revision) while pollers read
 * the status API over keep-alive connections; then counts what the database holds against what was
 * acknowledged.
 */
export async function runLoad(options: LoadOptions): Promise<LoadResult> {
  const days = Math.min(250, options.batchRows / 2);
  const perPipeline = options.batchRows / (2 * days);
  if (!Number.isInteger(perPipeline)) throw new Error(`${options.batchRows}-row batches do not split into whole campaigns of ${days} days`);
  const owned: string[][] = [];
  for (let p = 0; p < options.pipelines; p++) {
    const made = await Promise.all(Array.from({ length: perPipeline }, (_, i) => createBenchCampaign(options.workspace.admin, p * perPipeline + i, days)));
    owned.push(made.map((campaign) => campaign.id));
  }
  const campaigns = owned.flat();
  options.log?.(`${campaigns.length} campaigns registered; ${options.pipelines} pipelines and ${options.pollers} pollers for ${options.seconds} s`);

  const deadline = Date.now() + options.seconds * 1000;
  const started = performance.now();
  const latencies: number[] = [];
  const batchErrors: Record<string, number> = {};
  const lastAcknowledged: (number | null)[] = owned.map(() => null);
  let sent = 0;
  let acknowledged = 0;
  const pipelines = owned.map(async (campaignIds, pipeline) => {
    for (let sequence = 0; Date.now() < deadline; sequence++) {
      const body = JSON.stringify({ rows: batchRows(campaignIds, days, sequence) });
      const before = performance.now();
      sent += 1;
      try {
        const headers = { authorization: `Bearer ${options.workspace.keys[pipeline]}`, "idempotency-key": randomUUID() };
        const answer = await postJson(new URL("/api/v1/ingest", options.appUrl), body, headers, 60_000);
        latencies.push(performance.now() - before);
        if (answer.status === 200) {
          acknowledged += 1;
          lastAcknowledged[pipeline] = sequence;
        } else {
          batchErrors[answer.status] = (batchErrors[answer.status] ?? 0) + 1;
        }
      } catch (error) {
        const code = (error as NodeJS.ErrnoException).code ?? "dropped";
        batchErrors[code] = (batchErrors[code] ?? 0) + 1;
      }
    }
  });
  let polls = 0;
  const polling = poll({
    url: options.appUrl,
    connections: options.pollers,
    duration: options.seconds,
    headers: { authorization: `Bearer ${options.workspace.keys[0]}` },
    requests: [
      {
        method: "GET",
        setupRequest: (request) => ({ ...request, path: `/api/v1/campaigns/${campaigns[polls++ % campaigns.length]}/status` }),
      },
    ],
  });
  const [polled] = await Promise.all([polling, Promise.all(pipelines)]);
  const wallSeconds = (performance.now() - started) / 1000;

  const pollErrors: Record<string, number> = {};
  for (const [status, stats] of Object.entries(polled.statusCodeStats ?? {})) {
    if (!status.startsWith("2")) pollErrors[status] = stats.count;
  }
  if (polled.errors > 0) pollErrors.dropped = polled.errors;
  if (polled.timeouts > 0) pollErrors.timeout = polled.timeouts;

  const stored = await countStored(options.databaseUrl, owned, days, lastAcknowledged);
  const rowsAcknowledged = acknowledged * options.batchRows;
  const result: LoadResult = {
    seconds: options.seconds,
    pipelines: options.pipelines,
    batchRows: options.batchRows,
    pollers: options.pollers,
    batches: {
      sent,
      acknowledged,
      perSecond: round(acknowledged / wallSeconds),
      rowsPerSecond: Math.round(rowsAcknowledged / wallSeconds),
      latencyMs: { p50: Math.round(percentile(latencies, 0.5)), p99: Math.round(percentile(latencies, 0.99)), max: Math.round(Math.max(0, ...latencies)) },
      errorsByStatus: batchErrors,
    },
    polls: {
      sent: polled.requests.total,
      perSecond: round(polled.requests.total / polled.duration),
      latencyMs: { p50: polled.latency.p50, p99: polled.latency.p99, max: polled.latency.max },
      errorsByStatus: pollErrors,
    },
    rows: { acknowledged: rowsAcknowledged, inDatabase: stored.rows, lost: rowsAcknowledged - stored.rows, wrongValues: stored.wrongValues },
    errors: Object.values(batchErrors).reduce((a, b) => a + b, 0) + Object.values(pollErrors).reduce((a, b) => a + b, 0),
  };
  return result;
}

/**
 * Rows the database holds for the campaigns: current counts plus kept revisions (one per replaced
 * value), and how many current counts differ from the last acknowledged batch of their pipeline.
 */
async function countStored(databaseUrl: string, owned: string[][], days: number, lastAcknowledged: (number | null)[]): Promise<{ rows: number; wrongValues: number }> {
  const campaigns = owned.flat();
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  try {
    const current = await pool.query<{ campaign_id: string; arm: string; day: string; units: number; sum: number }>(
      "select c.campaign_id, a.key as arm, to_char(c.day, 'YYYY-MM-DD') as day, c.units, c.sum from daily_counts c join arms a on a.id = c.arm_id where c.campaign_id = any($1)",
      [campaigns],
    );
    const revisions = await pool.query<{ n: number }>("select count(*)::int as n from daily_count_revisions where campaign_id = any($1)", [campaigns]);
    const expected = new Map<string, IngestRow>();
    owned.forEach((campaignIds, pipeline) => {
      const sequence = lastAcknowledged[pipeline];
      if (sequence === null) return;
      for (const row of batchRows(campaignIds, days, sequence)) expected.set(`${row.campaign}|${row.arm}|${row.date}`, row);
    });
    let wrongValues = expected.size - current.rows.length;
    for (const row of current.rows) {
      const want = expected.get(`${row.campaign_id}|${row.arm}|${row.day}`);
      if (!want || want.units !== row.units || want.conversions !== row.sum) wrongValues += 1;
    }
    return { rows: current.rows.length + revisions.rows[0].n, wrongValues: Math.max(0, wrongValues) };
  } finally {
    await pool.end();
  }
}

function round(value: number): number {
  return Math.round(value * 10) / 10;
}
