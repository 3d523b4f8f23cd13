/**
 * The status API under polling against the app's most trivial route handler, same server, same run,
 * same load tool (autocannon, in this process).
 *
 * `npm run bench:status` starts its own PostgreSQL (in /dev/shm) and the app's production build on
 * loopback, makes a Northwind Outfitters campaign with 90 days of counts pushed through the ingest
 * API and analysed by the worker, then
 *   - floods `GET /api/health` (the trivial handler: one `select 1`) and
 *     `GET /api/v1/campaigns/:id/status` (pipeline key) with 100 keep-alive connections for 10 s each;
 *   - offers a fixed 600 requests/s to the status route over 100 keep-alive connections for 10 s, paced
 *     (bench/lib/paced-load.ts: one request every 1/600 s, latency from its scheduled start) and reads
 *     its p99; and the same through autocannon's `overallRate`, which sends each connection's share back
 *     to back at the top of every second (a burst of 600 each second, kept for comparison);
 *   - floods the status route as a dashboard polls it: the admin's session cookie, with and without
 *     the ETag of the last answer (If-None-Match: 304 without a body).
 * Each row also says how much CPU the app and this process (the load tool) used, and the load average.
 * Writes bench/results/status-api.json.
 */
import autocannon from "autocannon";
import os from "node:os";
import { pacedLoad } from "./lib/paced-load";
import { machineLine, ownCpuMs, printTable, processCpuMs, seedAnalysedCampaign, startBenchStack, writeResults } from "./lib/stack";

const CONNECTIONS = 100;
const DURATION_SECONDS = 10;
const OFFERED_RATE = 600;
const TARGETS = { throughputShareOfTrivial: 0.8, p99AtOfferedRateMs: 50 };

interface Load {
  requestsPerSecond: number;
  latencyMs: { p50: number; p90: number; p99: number; max: number };
  non2xx: number;
  errors: number;
  appCpuShare: number;
  loadToolCpuShare: number;
  loadAverage1m: number;
  maxScheduleLagMs?: number;
}

const cores = (ms: number, wall: number) => Math.round((ms / wall) * 100) / 100;

async function measured<T>(work: () => Promise<T>): Promise<{ value: T; appCpuShare: number; loadToolCpuShare: number; loadAverage1m: number }> {
  const app = processCpuMs(appPid);
  const own = ownCpuMs();
  const started = performance.now();
  const value = await work();
  const wall = performance.now() - started;
  return { value, appCpuShare: cores(processCpuMs(appPid) - app, wall), loadToolCpuShare: cores(ownCpuMs() - own, wall), loadAverage1m: Math.round(os.loadavg()[0] * 100) / 100 };
}

async function load(url: string, headers: Record<string, string>, overallRate?: number): Promise<Load> {
  const { value: result, ...cpu } = await measured(() =>
    autocannon({ url, connections: CONNECTIONS, duration: DURATION_SECONDS, headers, ...(overallRate ? { overallRate } : {}) }),
  );
  return {
    requestsPerSecond: Math.round(result.requests.average),
    latencyMs: { p50: result.latency.p50, p90: result.latency.p90, p99: result.latency.p99, max: result.latency.max },
    non2xx: result.non2xx,
    errors: result.errors,
    ...cpu,
  };
}

async function paced(url: string, headers: Record<string, string>): Promise<Load> {
  const { value: result, ...cpu } = await measured(() => pacedLoad({ url, headers, rate: OFFERED_RATE, connections: CONNECTIONS, durationSeconds: DURATION_SECONDS }));
  const { requestsPerSecond, latencyMs, non2xx, errors, maxScheduleLagMs } = result;
  return { requestsPerSecond, latencyMs, non2xx, errors, maxScheduleLagMs, ...cpu };
}

let appPid: number | undefined;

async function main(): Promise<void> {
  const stack = await startBenchStack({ app: true });
  try {
    const appUrl = stack.appUrl!;
    appPid = stack.app!.child.pid;
    const { workspace, campaign, recomputed } = await seedAnalysedCampaign(stack, 990);
    if (recomputed !== 1) throw new Error("the worker did not analyse the campaign");

    const headers = { authorization: `Bearer ${workspace.keys[0]}` };
    const statusUrl = `${appUrl}/api/v1/campaigns/${campaign.id}/status`;
    const probe = await fetch(statusUrl, { headers });
    if (probe.status !== 200) throw new Error(`status answered ${probe.status}: ${await probe.text()}`);

    // A short warm-up of both routes, outside the figures.
    await autocannon({ url: `${appUrl}/api/health`, connections: 10, amount: 500 });
    await autocannon({ url: statusUrl, connections: 10, amount: 500, headers });

    const trivial = await load(`${appUrl}/api/health`, {});
    const status = await load(statusUrl, headers);
    const fixed = await paced(statusUrl, headers);
    const bursts = await load(statusUrl, headers, OFFERED_RATE);
    const cookie = [...workspace.admin.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
    const session = await load(statusUrl, { cookie });
    const etag = (await fetch(statusUrl, { headers: { cookie } })).headers.get("etag") ?? "";
    const conditional = await load(statusUrl, { cookie, "if-none-match": etag });
    const share = Math.round((status.requestsPerSecond / trivial.requestsPerSecond) * 100) / 100;
    const machine = machineLine();
    const results = {
      bench: "status-api",
      ranAt: new Date().toISOString(),
      machine,
      loadTool: "autocannon 8.0.0 for the floods; bench/lib/paced-load.ts for the paced fixed rate (both in the bench process)",
      connections: CONNECTIONS,
      durationSeconds: DURATION_SECONDS,
      targets: TARGETS,
      trivialRoute: { path: "/api/health", ...trivial },
      statusRoute: { path: "/api/v1/campaigns/:id/status", ...status, shareOfTrivial: share, meetsTarget: share >= TARGETS.throughputShareOfTrivial },
      sessionRoute: { path: "/api/v1/campaigns/:id/status (session cookie)", ...session },
      conditionalRoute: { path: "/api/v1/campaigns/:id/status (session cookie, If-None-Match: 304)", ...conditional },
      fixedRate: { offeredPerSecond: OFFERED_RATE, pacing: "one request every 1/600 s, latency from its scheduled start", ...fixed, meetsTarget: fixed.latencyMs.p99 < TARGETS.p99AtOfferedRateMs && fixed.non2xx === 0 },
      autocannonOverallRate: { offeredPerSecond: OFFERED_RATE, pacing: "each connection's share back to back at the top of every second", ...bursts },
    };
    console.log(`\nStatus API under polling (autocannon, ${CONNECTIONS} keep-alive connections, ${DURATION_SECONDS} s each)`);
    console.log(`machine: ${machine.cpus} CPUs, load average ${machine.loadAverage.join(" / ")}, Node ${machine.node}\n`);
    const row = (name: string, measured: Load, vs: string, target: string, met: boolean | "") => ({
      load: name,
      "req/s": measured.requestsPerSecond,
      "p50 ms": measured.latencyMs.p50,
      "p99 ms": measured.latencyMs.p99,
      "max ms": measured.latencyMs.max,
      non2xx: measured.non2xx,
      errors: measured.errors,
      "app cores": measured.appCpuShare,
      "tool cores": measured.loadToolCpuShare,
      "load avg": measured.loadAverage1m,
      "vs trivial": vs,
      target,
      met: met === "" ? "" : met ? "yes" : "NO",
    });
    printTable([
      row("flood /api/health (trivial)", trivial, "1", "", ""),
      row("flood status", status, String(share), "≥ 0.8", results.statusRoute.meetsTarget),
      row(`status at ${OFFERED_RATE}/s offered, paced`, fixed, "", "p99 < 50 ms", results.fixedRate.meetsTarget),
      row(`status, autocannon overallRate ${OFFERED_RATE}`, bursts, "", "", ""),
      row("flood status, session cookie", session, String(Math.round((session.requestsPerSecond / trivial.requestsPerSecond) * 100) / 100), "", ""),
      row("flood status, cookie + If-None-Match", conditional, String(Math.round((conditional.requestsPerSecond / trivial.requestsPerSecond) * 100) / 100), "", ""),
    ]);
    const file = writeResults("status-api", results);
    console.log(`\nwrote ${file}`);
  } finally {
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
