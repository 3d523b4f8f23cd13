/**
 * The worker's recompute at scale against a read-and-write floor, same run, same PostgreSQL.
 *
 * `npm run bench:recompute` starts its own PostgreSQL (in /dev/shm), fills it with N running
 * Northwind Outfitters campaigns × 90 days × 2 arms (straight in SQL), then times
 *   - the full worker pass (`runRecompute`, every campaign never analysed),
 *   - an incremental pass after one new day for 1 % of the campaigns,
 *   - the floor: reading the same daily rows through a cursor with numeric type parsers, plus COPY
 *     of the analysis rows the full pass wrote.
 * Peak memory is the highest RSS sampled every 20 ms during the pass, beside the RSS before it.
 * N = 1,000 by default; `--campaigns 10000` for the large run. Writes bench/results/recompute.json.
 */
import { spawnSync } from "node:child_process";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import pg from "pg";
import Cursor from "pg-cursor";
import { from as copyFrom, to as copyTo } from "pg-copy-streams";
import { WORKER_V8_FLAGS } from "../cron/config";
import { machineLine, printTable, startBenchStack, timed, writeResults } from "./lib/stack";

const DAYS = 90;
const TARGETS = { fullPassRatioToFloor: 1.5, peakMemoryMiB: 250, incrementalPassMs: 500 };

function argument(name: string, fallback: number): number {
  const index = process.argv.indexOf(name);
  return index >= 0 ? Number(process.argv[index + 1]) : fallback;
}

async function fill(pool: pg.Pool, campaigns: number, tau: number, plan: unknown): Promise<void> {
  await pool.query(`insert into organizations (id, name, slug, created_at) values ('bench-northwind', 'Northwind Outfitters', 'northwind-bench', now())`);
  await pool.query(
    `insert into campaigns (workspace_id, name, slug, metric_kind, metric_name, baseline_rate, minimum_lift, alpha, power, sides,
       start_date, max_days, daily_units, tau, plan, status)
     select 'bench-northwind', 'Northwind trail campaign ' || g, 'trail-campaign-' || g, 'conversion', 'First purchase', 0.05, 0.1, 0.05, 0.8, 2,
       current_date - ${DAYS}, 120, 20000, $1, $2::jsonb, 'running'
     from generate_series(1, $3) g`,
    [tau, JSON.stringify(plan), campaigns],
  );
  await pool.query(
    `insert into arms (campaign_id, key, name, planned_share, is_holdout, position)
     select id, 'holdout', 'Holdout', 0.1, true, 0 from campaigns
     union all select id, 'treatment', 'Trail e-mail', 0.9, false, 1 from campaigns`,
  );
  // Counts with a little day-to-day noise; every fifth campaign carries a real lift.
  await pool.query(
    `insert into daily_counts (campaign_id, arm_id, day, units, sum, sum_squares, source)
     select a.campaign_id, a.id, c.start_date + d, u.units, u.conversions, u.conversions, 'seed'
     from arms a join campaigns c on c.id = a.campaign_id
     cross join generate_series(0, ${DAYS - 1}) d
     cross join lateral (select case when a.is_holdout then 2000 else 18000 end as units) base
     cross join lateral (
       select base.units as units,
              round(base.units * 0.05 * (case when not a.is_holdout and hashtext(c.id::text) % 5 = 0 then 1.12 else 1 end)
                    * (0.9 + 0.2 * ((hashtext(a.id::text || d::text) & 1023) / 1023.0)))::int as conversions
     ) u`,
  );
  await pool.query("analyze");
}

async function readFloor(url: string): Promise<number> {
  const types = { getTypeParser: (oid: number, format?: "text" | "binary") => (oid === 20 || oid === 23 || oid === 701 ? Number : pg.types.getTypeParser(oid, format)) };
  const client = new pg.Client({ connectionString: url, types: types as never });
  await client.connect();
  let count = 0;
  try {
    const cursor = client.query(
      new Cursor(
        `select dc.campaign_id, dc.day::text, a.key, dc.units, dc.sum, dc.sum_squares
         from daily_counts dc join arms a on a.id = dc.arm_id order by dc.campaign_id, dc.day, a.key`,
      ),
    );
    for (;;) {
      const rows = await cursor.read(5_000);
      if (rows.length === 0) break;
      count += rows.length;
    }
    await cursor.close();
  } finally {
    await client.end();
  }
  return count;
}

async function copyFloor(pool: pg.Pool): Promise<number> {
  const client = await pool.connect();
  try {
    const chunks: Buffer[] = [];
    const out = client.query(copyTo("copy analysis_days to stdout"));
    for await (const part of out) chunks.push(part as Buffer);
    await client.query("create table if not exists bench_copy_floor (like analysis_days including defaults including indexes including constraints)");
    await client.query("truncate bench_copy_floor");
    const started = performance.now();
    await pipeline(Readable.from(chunks), client.query(copyFrom("copy bench_copy_floor from stdin")));
    return performance.now() - started;
  } finally {
    client.release();
  }
}

async function main(): Promise<void> {
  const campaigns = argument("--campaigns", 1_000);
  const stack = await startBenchStack({ app: false });
  Object.assign(process.env, stack.env, { LOG_LEVEL: "silent", RECOMPUTE_HOLD_MS: "0" });
  const { runRecompute } = await import("../cron/recompute");
  const { computePlan } = await import("../lib/campaigns/compute-plan");
  const { closeDb } = await import("../db");
  const pool = new pg.Pool({ connectionString: stack.databaseUrl, max: 2 });
  try {
    const sized = computePlan(
      {
        metric: { kind: "conversion", name: "First purchase" },
        baselineRate: 0.05,
        minimumLift: 0.1,
        alpha: 0.05,
        power: 0.8,
        sides: 2,
        arms: [
          { key: "holdout", name: "Holdout", share: 0.1 },
          { key: "treatment", name: "Trail e-mail", share: 0.9 },
        ],
      } as never,
      20_000,
    );
    process.stderr.write(`[bench] filling ${campaigns} campaigns × ${DAYS} days × 2 arms\n`);
    await fill(pool, campaigns, sized.tau, sized.plan);
    const who = { clusterRoot: stack.cluster.root };

    const rssBefore = process.memoryUsage().rss;
    let peakRss = rssBefore;
    const peaks = { heapTotal: 0, heapUsed: 0, external: 0 };
    const sampler = setInterval(() => {
      const usage = process.memoryUsage();
      peakRss = Math.max(peakRss, usage.rss);
      peaks.heapTotal = Math.max(peaks.heapTotal, usage.heapTotal);
      peaks.heapUsed = Math.max(peaks.heapUsed, usage.heapUsed);
      peaks.external = Math.max(peaks.external, usage.external);
    }, 20);
    const full = await timed(() => runRecompute({ wait: true }), who);
    clearInterval(sampler);
    if (full.value.recomputed !== campaigns) throw new Error(`full pass recomputed ${full.value.recomputed} of ${campaigns}`);
    const { rows: written } = await pool.query<{ count: string }>("select count(*) from analysis_days");

    const floorRead = await timed(() => readFloor(stack.databaseUrl), who);
    const copyMs = await copyFloor(pool);
    const floorMs = floorRead.timing.wallMs + copyMs;

    // One new day for 1 % of the campaigns, marked the way ingest marks them.
    const changed = Math.max(1, Math.round(campaigns / 100));
    await pool.query(
      `with picked as (select id, start_date from campaigns order by id limit $1),
       added as (insert into daily_counts (campaign_id, arm_id, day, units, sum, sum_squares, source)
         select a.campaign_id, a.id, p.start_date + ${DAYS}, case when a.is_holdout then 2000 else 18000 end,
                case when a.is_holdout then 100 else 900 end, case when a.is_holdout then 100 else 900 end, 'seed'
         from arms a join picked p on p.id = a.campaign_id returning campaign_id)
       update campaigns set counts_changed_at = clock_timestamp() where id in (select campaign_id from added)`,
      [changed],
    );
    // Incremental passes run every 10 minutes, long after autovacuum has dealt with the nightly pass's rewrite
    // of analysis_days (and here the floor's COPY); do that now, outside the timing, instead of racing it.
    await pool.query("vacuum (analyze) analysis_days, campaigns, daily_counts");
    await pool.query("drop table if exists bench_copy_floor");
    const incremental = await timed(() => runRecompute({ wait: true }), who);
    if (incremental.value.recomputed !== changed) throw new Error(`incremental pass recomputed ${incremental.value.recomputed} of ${changed}`);

    const mib = (bytes: number) => Math.round((bytes / 1048576) * 10) / 10;
    const ratio = Math.round((full.timing.wallMs / floorMs) * 100) / 100;
    const results = {
      bench: "recompute",
      ranAt: new Date().toISOString(),
      machine: machineLine(),
      campaigns,
      days: DAYS,
      dailyRows: floorRead.value,
      analysisRowsWritten: Number(written[0].count),
      targets: TARGETS,
      fullPass: { ...full.timing, ratioToFloor: ratio, meetsTarget: ratio <= TARGETS.fullPassRatioToFloor, msPerCampaign: Math.round((full.timing.wallMs / campaigns) * 10) / 10 },
      memory: {
        rssBeforeMiB: mib(rssBefore),
        peakRssMiB: mib(peakRss),
        meetsTarget: mib(peakRss) <= TARGETS.peakMemoryMiB,
        // Where the RSS is: the JavaScript heap (reserved, used) and Buffers outside it, each its own peak.
        peakHeapTotalMiB: mib(peaks.heapTotal),
        peakHeapUsedMiB: mib(peaks.heapUsed),
        peakExternalMiB: mib(peaks.external),
      },
      floor: { cursorReadMs: floorRead.timing.wallMs, cursorReadCpu: floorRead.timing, copyWriteMs: Math.round(copyMs), totalMs: Math.round(floorMs) },
      incrementalPass: { campaigns: changed, ...incremental.timing, meetsTarget: incremental.timing.wallMs <= TARGETS.incrementalPassMs },
    };
    console.log(`\nRecompute: ${campaigns} running campaigns × ${DAYS} days × 2 arms (${floorRead.value} daily rows, ${results.analysisRowsWritten} analysis rows written)`);
    console.log(`machine: ${results.machine.cpus} CPUs, load average ${results.machine.loadAverage.join(" / ")}, Node ${results.machine.node}\n`);
    printTable([
      { step: "full worker pass", "wall ms": full.timing.wallMs, "bench CPU ms": full.timing.benchCpuMs, "pg CPU ms": full.timing.postgresCpuMs, "vs floor": ratio, target: "≤ 1.5×", met: results.fullPass.meetsTarget ? "yes" : "NO" },
      { step: "floor: cursor read", "wall ms": floorRead.timing.wallMs, "bench CPU ms": floorRead.timing.benchCpuMs, "pg CPU ms": floorRead.timing.postgresCpuMs, "vs floor": "", target: "", met: "" },
      { step: "floor: COPY of written rows", "wall ms": Math.round(copyMs), "bench CPU ms": "", "pg CPU ms": "", "vs floor": "", target: "", met: "" },
      { step: `incremental pass (${changed})`, "wall ms": incremental.timing.wallMs, "bench CPU ms": incremental.timing.benchCpuMs, "pg CPU ms": incremental.timing.postgresCpuMs, "vs floor": "", target: "≤ 500 ms", met: results.incrementalPass.meetsTarget ? "yes" : "NO" },
      { step: "peak RSS during full pass (MiB)", "wall ms": results.memory.peakRssMiB, "bench CPU ms": `before ${results.memory.rssBeforeMiB}`, "pg CPU ms": "", "vs floor": "", target: "≤ 250 MiB", met: results.memory.meetsTarget ? "yes" : "NO" },
    ]);
    const file = writeResults(campaigns === 1_000 ? "recompute" : `recompute-${campaigns}`, results);
    console.log(`\nwrote ${file}`);
  } finally {
    await pool.end();
    await closeDb();
    await stack.stop();
  }
}

// The pass runs in this process: run it with the worker process's V8 flags, or the memory figure is not the worker's.
if (WORKER_V8_FLAGS.every((flag) => process.execArgv.includes(flag))) {
  main().catch((error) => {
    console.error(error);
    process.exitCode = 1;
  });
} else {
  const again = spawnSync(process.execPath, [...WORKER_V8_FLAGS, ...process.execArgv, ...process.argv.slice(1)], { stdio: "inherit" });
  process.exitCode = again.status ?? 1;
}
