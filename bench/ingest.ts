/**
 * Ingest through the API against a COPY floor, same run, same PostgreSQL.
 *
 * `npm run bench:ingest` starts its own PostgreSQL (in /dev/shm) and the app's production build on
 * loopback, makes Northwind Outfitters with four pipeline keys, then for 1,000- and 5,000-row batches
 * sends every batch through `POST /api/v1/ingest` from four pipelines in parallel — first as new
 * rows, then again with changed values (replaced rows, revisions kept) — and COPYs the same rows into
 * a table shaped like daily_counts as the floor. Prints rows/s, the ratio to COPY and the CPU time of
 * the bench, the app and PostgreSQL; writes bench/results/ingest.json.
 */
import { randomUUID } from "node:crypto";
import { pipeline } from "node:stream/promises";
import { Readable } from "node:stream";
import pg from "pg";
import { from as copyFrom } from "pg-copy-streams";
import { createBenchCampaign, createBenchWorkspace, dayFromToday, machineLine, printTable, startBenchStack, timed, writeResults, type Timing } from "./lib/stack";

const PIPELINES = 4;
/** Days of counts per campaign: 2 arms × 250 days = 500 rows per campaign. */
const DAYS = 250;
const ROWS_PER_CAMPAIGN = 2 * DAYS;
const SIZES = [
  { batchRows: 1_000, batchesPerPipeline: 10 },
  { batchRows: 5_000, batchesPerPipeline: 5 },
];
const TARGETS = { newRowsPerSecond: 100_000, replacedRowsPerSecond: 50_000 };

interface Row {
  campaign: string;
  arm: string;
  date: string;
  units: number;
  conversions: number;
}

function rowsOf(campaignIds: string[], unitsBump: number): Row[] {
  const rows: Row[] = [];
  for (const campaign of campaignIds) {
    for (let day = 0; day < DAYS; day++) {
      const date = dayFromToday(-DAYS + day);
      rows.push({ campaign, arm: "holdout", date, units: 1_000 + unitsBump, conversions: 50 });
      rows.push({ campaign, arm: "treatment", date, units: 9_000 + unitsBump, conversions: 480 + (day % 7) });
    }
  }
  return rows;
}

async function sendBatches(appUrl: string, key: string, bodies: string[]): Promise<{ accepted: number; replaced: number; unchanged: number; latencies: number[] }> {
  const totals = { accepted: 0, replaced: 0, unchanged: 0, latencies: [] as number[] };
  for (const body of bodies) {
    const started = performance.now();
    const response = await fetch(`${appUrl}/api/v1/ingest`, {
      method: "POST",
      headers: { authorization: `Bearer ${key}`, "content-type": "application/json", "idempotency-key": randomUUID() },
      body,
    });
    const answer = (await response.json()) as { accepted: number; replaced: number; unchanged: number };
    totals.latencies.push(performance.now() - started);
    if (response.status !== 200) throw new Error(`ingest answered ${response.status}: ${JSON.stringify(answer).slice(0, 500)}`);
    totals.accepted += answer.accepted;
    totals.replaced += answer.replaced;
    totals.unchanged += answer.unchanged;
  }
  return totals;
}

async function copyFloor(pool: pg.Pool, rows: Row[], armIds: Map<string, string>): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query("truncate bench_copy_floor");
    const lines = rows.map((row) => `${row.campaign}\t${armIds.get(`${row.campaign}|${row.arm}`)}\t${row.date}\t${row.units}\t${row.conversions}\t${row.conversions}\tapi\n`);
    const stream = client.query(copyFrom("copy bench_copy_floor (campaign_id, arm_id, day, units, sum, sum_squares, source) from stdin"));
    await pipeline(Readable.from(chunk(lines, 1_000).map((part) => part.join(""))), stream);
  } finally {
    client.release();
  }
}

function chunk<T>(items: T[], size: number): T[][] {
  const parts: T[][] = [];
  for (let start = 0; start < items.length; start += size) parts.push(items.slice(start, start + size));
  return parts;
}

function percentile(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))] ?? 0;
}

async function main(): Promise<void> {
  const stack = await startBenchStack({ app: true });
  try {
    const appUrl = stack.appUrl!;
    const who = { appPid: stack.app!.child.pid, clusterRoot: stack.cluster.root };
    const workspace = await createBenchWorkspace(appUrl, stack.databaseUrl, PIPELINES);
    const pool = new pg.Pool({ connectionString: stack.databaseUrl, max: 2 });
    await pool.query("create table bench_copy_floor (like daily_counts including defaults including indexes including constraints)");

    const results: Record<string, unknown>[] = [];
    const table: Record<string, string | number>[] = [];
    for (const size of SIZES) {
      const campaignsPerBatch = size.batchRows / ROWS_PER_CAMPAIGN;
      const perPipeline = campaignsPerBatch * size.batchesPerPipeline;
      process.stderr.write(`[bench] registering ${PIPELINES * perPipeline} campaigns for ${size.batchRows}-row batches\n`);
      const campaignsByPipeline: string[][] = [];
      let index = 0;
      for (let p = 0; p < PIPELINES; p++) {
        const ids: string[] = [];
        for (let c = 0; c < perPipeline; c += 4) {
          const made = await Promise.all(Array.from({ length: Math.min(4, perPipeline - c) }, () => createBenchCampaign(workspace.admin, index++, DAYS)));
          ids.push(...made.map((campaign) => campaign.id));
        }
        campaignsByPipeline.push(ids);
      }
      const allIds = campaignsByPipeline.flat();
      const { rows: armRows } = await pool.query<{ campaign_id: string; key: string; id: string }>("select campaign_id, key, id from arms where campaign_id = any($1)", [allIds]);
      const armIds = new Map(armRows.map((arm) => [`${arm.campaign_id}|${arm.key}`, arm.id]));

      for (const phase of ["new", "replaced"] as const) {
        const bump = phase === "new" ? 0 : 1;
        const bodies = campaignsByPipeline.map((ids) => chunk(ids, campaignsPerBatch).map((part) => JSON.stringify({ rows: rowsOf(part, bump) })));
        const rowCount = PIPELINES * size.batchesPerPipeline * size.batchRows;
        const api = await timed(() => Promise.all(bodies.map((pipelineBodies, p) => sendBatches(appUrl, workspace.keys[p], pipelineBodies))), who);
        const written = api.value.reduce((sum, one) => sum + (phase === "new" ? one.accepted : one.replaced), 0);
        if (written !== rowCount) throw new Error(`expected ${rowCount} ${phase} rows, the API reported ${written}`);
        const allRows = allIds.length > 0 ? rowsOf(allIds, bump) : [];
        const floor = await timed(() => copyFloor(pool, allRows, armIds), { clusterRoot: stack.cluster.root });
        const latencies = api.value.flatMap((one) => one.latencies);
        const apiRate = Math.round((rowCount / api.timing.wallMs) * 1000);
        const copyRate = Math.round((rowCount / floor.timing.wallMs) * 1000);
        const target = phase === "new" ? TARGETS.newRowsPerSecond : TARGETS.replacedRowsPerSecond;
        const entry = {
          batchRows: size.batchRows,
          phase,
          rows: rowCount,
          pipelines: PIPELINES,
          apiRowsPerSecond: apiRate,
          copyRowsPerSecond: copyRate,
          ratioToCopy: Math.round((apiRate / copyRate) * 1000) / 1000,
          targetRowsPerSecond: target,
          meetsTarget: apiRate >= target,
          batchLatencyMs: { p50: Math.round(percentile(latencies, 0.5)), p95: Math.round(percentile(latencies, 0.95)), max: Math.round(Math.max(...latencies)) },
          api: api.timing as Timing,
          copy: floor.timing as Timing,
        };
        results.push(entry);
        table.push({
          batch: size.batchRows,
          phase,
          rows: rowCount,
          "API rows/s": apiRate,
          "COPY rows/s": copyRate,
          "API/COPY": entry.ratioToCopy,
          target: target,
          met: entry.meetsTarget ? "yes" : "NO",
          "p50 ms": entry.batchLatencyMs.p50,
          "wall ms": api.timing.wallMs,
          "app CPU ms": api.timing.appCpuMs,
          "pg CPU ms": api.timing.postgresCpuMs,
          "bench CPU ms": api.timing.benchCpuMs,
          load: api.timing.loadAverage1m,
        });
      }
    }
    await pool.end();
    const machine = machineLine();
    console.log(`\nIngest through POST /api/v1/ingest, ${PIPELINES} pipelines in parallel, vs COPY of the same rows (one stream)`);
    console.log(`machine: ${machine.cpus} CPUs, load average ${machine.loadAverage.join(" / ")}, Node ${machine.node}\n`);
    printTable(table);
    const file = writeResults("ingest", { bench: "ingest", ranAt: new Date().toISOString(), machine, targets: TARGETS, results });
    console.log(`\nwrote ${file}`);
  } finally {
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
