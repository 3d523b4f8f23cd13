/**
 * Where the status API's time goes: `NEXT_DIST_DIR=.next-status npx tsx bench/status-profile.ts` seeds the status bench's campaign,
 * then for each route (the trivial `/api/health`, status with a pipeline key, status with a session
 * cookie) restarts `next start` under `--cpu-prof`, floods it with autocannon (100 connections, 10 s),
 * stops it (the profile is written on exit) and prints the top self-time functions, the busy time by
 * owner (package or source file, through the bundle's source maps), and the database statements per request (pg_stat_database commits over 2,000 calls).
 * Profiles land in $TMPDIR/peeksafe-status-profiles/ (`--summarize` prints them again).
 */
import { mkdirSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { SourceMap } from "node:module";
import os from "node:os";
import path from "node:path";
import autocannon from "autocannon";
import pg from "pg";
import { spawn } from "node:child_process";
import { productionEnv } from "../scripts/lib/app-server";
import { startThrowawayStack } from "../scripts/lib/stack";
import { BENCH_DIST_DIR, machineLine, seedAnalysedCampaign } from "./lib/stack";

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  children?: number[];
}
interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

const PROFILE_DIR = path.join(os.tmpdir(), "peeksafe-status-profiles");

const maps = new Map<string, SourceMap | null>();

function sourceMapOf(url: string): SourceMap | null {
  if (!maps.has(url)) {
    try {
      maps.set(url, new SourceMap(JSON.parse(readFileSync(`${url.replace(/^file:\/\//, "")}.map`, "utf8"))));
    } catch {
      maps.set(url, null);
    }
  }
  return maps.get(url)!;
}

function moduleGroup(source: string): string {
  const modules = source.lastIndexOf("node_modules/");
  if (modules >= 0) {
    const rest = source.slice(modules + 13).split("/");
    return rest[0].startsWith("@") ? `${rest[0]}/${rest[1]}` : rest[0];
  }
  return source.replace(/^.*\[project\]\//, "").replace(/^file:\/\//, "").replace(process.cwd(), ".");
}

/** The package (or our own source file) a frame runs in, through the bundle's source map. */
function packageOf(frame: { url: string; lineNumber: number; columnNumber?: number }): string {
  const { url } = frame;
  if (!url) return "(native / GC / idle)";
  if (url.startsWith("node:")) return "node internals";
  if (url.includes("/server/chunks/") || url.includes("/server/app/")) {
    const entry = sourceMapOf(url)?.findEntry(frame.lineNumber, frame.columnNumber ?? 0) as { originalSource?: string } | undefined;
    return entry?.originalSource ? moduleGroup(entry.originalSource) : "app server chunks (unmapped)";
  }
  return moduleGroup(url);
}

const NATIVE = new Set(["(native / GC / idle)", "node internals"]);

/**
 * Busy time (idle excluded) in % of busy samples: self time by function, and by owner, the nearest frame
 * up the stack outside Node's internals and native code (who asked for the socket write, the abort signal…).
 */
export function summarize(profile: CpuProfile): { busyMs: number; self: [string, number][]; owners: [string, number][] } {
  const byId = new Map(profile.nodes.map((node) => [node.id, node]));
  const parent = new Map<number, number>();
  for (const node of profile.nodes) for (const child of node.children ?? []) parent.set(child, node.id);
  const selfMs = new Map<number, number>();
  profile.samples.forEach((id, index) => selfMs.set(id, (selfMs.get(id) ?? 0) + (profile.timeDeltas[index] ?? 0) / 1000));
  const self = new Map<string, number>();
  const owners = new Map<string, number>();
  let busy = 0;
  for (const [id, ms] of selfMs) {
    const frame = byId.get(id)!.callFrame;
    const { functionName, url, lineNumber } = frame;
    if (functionName === "(idle)") continue;
    busy += ms;
    const name = `${functionName || "(anonymous)"} ${packageOf(frame)}${url && !url.includes("/server/") ? `:${lineNumber + 1}` : ""}`;
    self.set(name, (self.get(name) ?? 0) + ms);
    let owner = functionName === "(garbage collector)" ? "garbage collector" : "(no JavaScript caller)";
    for (let at: number | undefined = id; at !== undefined && functionName !== "(garbage collector)"; at = parent.get(at)) {
      const caller = byId.get(at)!.callFrame;
      const group = packageOf(caller);
      if (NATIVE.has(group) || caller.functionName === "(root)") continue;
      owner = group;
      break;
    }
    owners.set(owner, (owners.get(owner) ?? 0) + ms);
  }
  const share = (entries: Map<string, number>) =>
    [...entries].sort((a, b) => b[1] - a[1]).map(([name, ms]) => [name, Math.round((ms / busy) * 1000) / 10] as [string, number]);
  return { busyMs: Math.round(busy), self: share(self).slice(0, 25), owners: share(owners).slice(0, 20) };
}

function printProfile(dir: string): void {
  const file = readdirSync(dir).find((name) => name.endsWith(".cpuprofile"));
  if (!file) throw new Error(`no profile written in ${dir}`);
  const { busyMs, self, owners } = summarize(JSON.parse(readFileSync(path.join(dir, file), "utf8")) as CpuProfile);
  console.log(`busy ${busyMs} ms; by owner (% of busy samples):`);
  for (const [name, share] of owners) console.log(`  ${share.toFixed(1).padStart(5)}  ${name}`);
  console.log("top self time (% of busy samples):");
  for (const [name, share] of self) console.log(`  ${share.toFixed(1).padStart(5)}  ${name}`);
}

// A backend flushes its statistics within PGSTAT_IDLE_INTERVAL (10 s) of going idle: wait past it.
async function commits(databaseUrl: string): Promise<number> {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  await new Promise((resolve) => setTimeout(resolve, 11_000));
  const { rows } = await pool.query<{ n: string }>("select xact_commit as n from pg_stat_database where datname = current_database()");
  await pool.end();
  return Number(rows[0].n);
}

// `--cpu-prof` is refused in NODE_OPTIONS: Next's CLI runs under `node --cpu-prof` itself (it serves in-process).
async function startProfiledApp(url: string, env: NodeJS.ProcessEnv, dir: string) {
  const port = new URL(url).port;
  const child = spawn(process.execPath, ["--cpu-prof", `--cpu-prof-dir=${dir}`, path.resolve("node_modules/next/dist/bin/next"), "start", "--hostname", "127.0.0.1", "--port", port], {
    env: productionEnv(env),
    stdio: ["ignore", "ignore", "inherit"],
  });
  for (let tries = 0; ; tries++) {
    if (child.exitCode !== null) throw new Error(`next start exited with code ${child.exitCode}`);
    const up = await fetch(`${url}/api/health`).then((response) => response.ok, () => false);
    if (up) break;
    if (tries > 240) throw new Error("next start did not answer within 60 s");
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  return {
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      }),
  };
}

async function main(): Promise<void> {
  if (process.argv.includes("--summarize")) {
    for (const name of readdirSync(PROFILE_DIR)) {
      console.log(`\n## ${name}`);
      printProfile(path.join(PROFILE_DIR, name));
    }
    return;
  }
  // Profiles the build as it is (`--rebuild` to build first): a shared checkout's edits would otherwise rebuild it.
  const rebuild = process.argv.includes("--rebuild");
  const stack = await startThrowawayStack({ app: true, distDir: BENCH_DIST_DIR, prefix: "peeksafe-bench-", rebuild, reuseBuild: !rebuild, log: (line) => process.stderr.write(`[bench] ${line}\n`) });
  try {
    const appUrl = stack.appUrl!;
    const { workspace, campaign } = await seedAnalysedCampaign(stack, 990);
    const statusUrl = `${appUrl}/api/v1/campaigns/${campaign.id}/status`;
    const cookie = [...workspace.admin.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
    const routes: { name: string; url: string; headers: Record<string, string> }[] = [
      { name: "health", url: `${appUrl}/api/health`, headers: {} },
      { name: "status-key", url: statusUrl, headers: { authorization: `Bearer ${workspace.keys[0]}` } },
      { name: "status-session", url: statusUrl, headers: { cookie } },
    ];
    await stack.app!.stop();
    rmSync(PROFILE_DIR, { recursive: true, force: true });
    mkdirSync(PROFILE_DIR, { recursive: true });
    console.log(`machine: load average ${machineLine().loadAverage.join(" / ")}`);
    for (const route of routes) {
      const dir = path.join(PROFILE_DIR, route.name);
      const app = await startProfiledApp(appUrl, stack.env, dir);
      try {
        const before = await commits(stack.databaseUrl);
        await autocannon({ url: route.url, connections: 10, amount: 2000, headers: route.headers });
        const perRequest = ((await commits(stack.databaseUrl)) - before - 1) / 2000;
        const flood = await autocannon({ url: route.url, connections: 100, duration: 10, headers: route.headers });
        console.log(`\n## ${route.name}: ${Math.round(flood.requests.average)} req/s, non2xx ${flood.non2xx}, ${perRequest.toFixed(2)} statements/request`);
      } finally {
        await app.stop();
      }
      printProfile(dir);
    }
  } finally {
    await stack.stop();
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
