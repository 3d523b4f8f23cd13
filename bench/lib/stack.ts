import { randomUUID } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import pg from "pg";
import { startThrowawayStack, type ThrowawayStack } from "../../scripts/lib/stack";

/** The build folder of the benches: apart from every other engineer's and the tests'. */
export const BENCH_DIST_DIR = process.env.NEXT_DIST_DIR ?? ".next-bench";

export type BenchStack = ThrowawayStack;

function log(message: string): void {
  process.stderr.write(`[bench] ${message}\n`);
}

/**
 * A throwaway world for one bench run (see `startThrowawayStack`), built into `.next-bench` when a
 * source is newer than that build (or with `--rebuild`).
 */
export async function startBenchStack(options: { app: boolean }): Promise<BenchStack> {
  return startThrowawayStack({ app: options.app, distDir: BENCH_DIST_DIR, prefix: "peeksafe-bench-", rebuild: process.argv.includes("--rebuild"), reuseBuild: process.argv.includes("--reuse-build"), log });
}

/** A cookie-keeping client for the app, sending our Origin like a browser. */
export class BenchClient {
  readonly cookies = new Map<string, string>();
  constructor(readonly baseUrl: string) {}

  async json<T = unknown>(pathname: string, init: RequestInit & { json?: unknown } = {}): Promise<{ status: number; body: T }> {
    const headers = new Headers(init.headers);
    headers.set("origin", this.baseUrl);
    if (this.cookies.size > 0) headers.set("cookie", [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; "));
    let body = init.body;
    if (init.json !== undefined) {
      headers.set("content-type", "application/json");
      body = JSON.stringify(init.json);
    }
    const response = await fetch(new URL(pathname, this.baseUrl), { ...init, headers, body, redirect: "manual" });
    for (const cookie of response.headers.getSetCookie()) {
      const [pair] = cookie.split(";");
      const index = pair.indexOf("=");
      this.cookies.set(pair.slice(0, index).trim(), pair.slice(index + 1).trim());
    }
    const text = await response.text();
    return { status: response.status, body: (text ? JSON.parse(text) : null) as T };
  }
}

export interface BenchWorkspace {
  workspaceId: string;
  admin: BenchClient;
  /** Pipeline keys with ingest and read permissions, their rate limit switched off (bench only). */
  keys: string[];
}

/**
 * Northwind Outfitters for a bench: an admin signed up through the API, a workspace and `keyCount`
 * pipeline keys made through the product's API. The keys' per-minute quota is switched off in the
 * database so the bench measures the work, not the quota.
 */
export async function createBenchWorkspace(appUrl: string, databaseUrl: string, keyCount: number): Promise<BenchWorkspace> {
  const admin = new BenchClient(appUrl);
  const email = `bench.${randomUUID().slice(0, 8)}@northwind.example`;
  const password = "northwind-bench-2026";
  const signUp = await admin.json("/api/auth/sign-up/email", { method: "POST", json: { email, password, name: "Bench admin" } });
  if (signUp.status !== 200) throw new Error(`sign-up failed: ${signUp.status} ${JSON.stringify(signUp.body)}`);
  const pool = new pg.Pool({ connectionString: databaseUrl, max: 1 });
  await pool.query("update users set email_verified = true where email = $1", [email]);
  const signIn = await admin.json("/api/auth/sign-in/email", { method: "POST", json: { email, password } });
  if (signIn.status !== 200) throw new Error(`sign-in failed: ${signIn.status}`);
  const created = await admin.json<{ id: string }>("/api/auth/organization/create", {
    method: "POST",
    json: { name: "Northwind Outfitters", slug: `northwind-${randomUUID().slice(0, 8)}` },
  });
  if (created.status !== 200) throw new Error(`workspace creation failed: ${created.status}`);
  await admin.json("/api/auth/organization/set-active", { method: "POST", json: { organizationId: created.body.id } });
  const keys: string[] = [];
  for (let index = 0; index < keyCount; index++) {
    const key = await admin.json<{ key: string }>("/api/v1/keys", {
      method: "POST",
      json: { name: `warehouse sync ${index + 1}`, permissions: ["ingest", "read"] },
    });
    if (key.status !== 201) throw new Error(`key creation failed: ${key.status} ${JSON.stringify(key.body)}`);
    keys.push(key.body.key);
  }
  await pool.query("update apikeys set rate_limit_enabled = false");
  await pool.end();
  return { workspaceId: created.body.id, admin, keys };
}

/** A day `offset` days from today (UTC), `YYYY-MM-DD`. */
export function dayFromToday(offset: number): string {
  const date = new Date();
  date.setUTCDate(date.getUTCDate() + offset);
  return date.toISOString().slice(0, 10);
}

/** Registers one conversion campaign through the API (10 % holdout), started `days` days ago. */
export async function createBenchCampaign(admin: BenchClient, index: number, days: number): Promise<{ id: string; slug: string }> {
  const response = await admin.json<{ id: string; slug: string }>("/api/v1/campaigns", {
    method: "POST",
    json: {
      name: `Northwind trail campaign ${index + 1}`,
      hypothesis: "The trail-gear e-mail lifts first purchases among newsletter subscribers.",
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
      startDate: dayFromToday(-days),
      maxDays: days + 30,
      dailyUnits: 20_000,
    },
  });
  if (response.status !== 201) throw new Error(`campaign creation failed: ${response.status} ${JSON.stringify(response.body)}`);
  return response.body;
}

/** Load average, CPU count and the Node version, printed with every bench. */
export function machineLine(): { loadAverage: number[]; cpus: number; node: string } {
  return { loadAverage: os.loadavg().map((value) => Math.round(value * 100) / 100), cpus: os.cpus().length, node: process.version };
}

/** CPU time (user + system) of a process from /proc, in ms; 0 when it cannot be read. */
export function processCpuMs(pid: number | undefined): number {
  if (!pid) return 0;
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
    const ticks = Number(fields[11]) + Number(fields[12]) + Number(fields[13]) + Number(fields[14]);
    return (ticks * 1000) / 100;
  } catch {
    return 0;
  }
}

/** Writes `bench/results/<name>.json`. */
export function writeResults(name: string, results: unknown): string {
  const folder = path.resolve("bench/results");
  mkdirSync(folder, { recursive: true });
  const file = path.join(folder, `${name}.json`);
  writeFileSync(file, `${JSON.stringify(results, null, 2)}\n`);
  return file;
}

/** CPU time of a PostgreSQL cluster: the postmaster, its reaped children and every live backend, in ms. */
export function clusterCpuMs(clusterRoot: string): number {
  let postmaster: number;
  try {
    postmaster = Number(readFileSync(path.join(clusterRoot, "data", "postmaster.pid"), "utf8").split("\n")[0]);
  } catch {
    return 0;
  }
  let total = processCpuMs(postmaster);
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const fields = readFileSync(`/proc/${entry}/stat`, "utf8").split(") ")[1].split(" ");
      if (Number(fields[1]) !== postmaster) continue;
      total += ((Number(fields[11]) + Number(fields[12])) * 1000) / 100;
    } catch {
      // the process ended meanwhile
    }
  }
  return total;
}

/** This process's CPU time (user + system) in ms. */
export function ownCpuMs(): number {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
}

/** Wall, bench-process, app and PostgreSQL CPU time of one measured step. */
export interface Timing {
  wallMs: number;
  benchCpuMs: number;
  appCpuMs: number;
  postgresCpuMs: number;
  loadAverage1m: number;
}

/** Times `work`, with the CPU the bench process, the app (when given) and PostgreSQL spent meanwhile. */
export async function timed<T>(work: () => Promise<T>, who: { appPid?: number; clusterRoot: string }): Promise<{ value: T; timing: Timing }> {
  const start = { wall: performance.now(), own: ownCpuMs(), app: processCpuMs(who.appPid), postgres: clusterCpuMs(who.clusterRoot) };
  const value = await work();
  const timing: Timing = {
    wallMs: Math.round(performance.now() - start.wall),
    benchCpuMs: Math.round(ownCpuMs() - start.own),
    appCpuMs: Math.round(processCpuMs(who.appPid) - start.app),
    postgresCpuMs: Math.round(clusterCpuMs(who.clusterRoot) - start.postgres),
    loadAverage1m: Math.round(os.loadavg()[0] * 100) / 100,
  };
  return { value, timing };
}

/** Prints rows as an aligned table, numbers right-aligned. */
export function printTable(rows: Record<string, string | number>[]): void {
  if (rows.length === 0) return;
  const columns = Object.keys(rows[0]);
  const widths = columns.map((column) => Math.max(column.length, ...rows.map((row) => String(row[column]).length)));
  const line = (cells: string[]) => cells.join("  ");
  console.log(line(columns.map((column, index) => column.padEnd(widths[index]))));
  console.log(line(widths.map((width) => "-".repeat(width))));
  for (const row of rows) {
    console.log(line(columns.map((column, index) => (typeof row[column] === "number" ? String(row[column]).padStart(widths[index]) : String(row[column]).padEnd(widths[index])))));
  }
}

/**
 * One campaign with 90 analysed days, as a dashboard sees it: registered and fed through the API,
 * launched, and recomputed once by the worker in this process. `treatmentConversions` is the
 * treatment arm's daily base (the holdout converts at 5 %).
 */
export async function seedAnalysedCampaign(
  stack: BenchStack,
  treatmentConversions: number,
): Promise<{ workspace: BenchWorkspace; campaign: { id: string; slug: string }; recomputed: number }> {
  const appUrl = stack.appUrl!;
  const workspace = await createBenchWorkspace(appUrl, stack.databaseUrl, 1);
  const campaign = await createBenchCampaign(workspace.admin, 0, 90);
  const rows = [];
  for (let day = 0; day < 90; day++) {
    const date = dayFromToday(-90 + day);
    rows.push({ campaign: campaign.id, arm: "holdout", date, units: 2_000, conversions: 100 + (day % 5) });
    rows.push({ campaign: campaign.id, arm: "treatment", date, units: 18_000, conversions: treatmentConversions + (day % 7) });
  }
  const pushed = await fetch(`${appUrl}/api/v1/ingest`, {
    method: "POST",
    headers: { authorization: `Bearer ${workspace.keys[0]}`, "content-type": "application/json", "idempotency-key": randomUUID() },
    body: JSON.stringify({ rows }),
  });
  if (pushed.status !== 200) throw new Error(`ingest answered ${pushed.status}`);
  // Launch it (a registered campaign is a draft until launched; the bench sets the status directly).
  const pool = new pg.Pool({ connectionString: stack.databaseUrl, max: 1 });
  await pool.query("update campaigns set status = 'running' where id = $1", [campaign.id]);
  await pool.end();
  Object.assign(process.env, stack.env, { LOG_LEVEL: "silent", RECOMPUTE_HOLD_MS: "0" });
  const { runRecompute } = await import("../../cron/recompute");
  const { closeDb } = await import("../../db");
  const pass = await runRecompute({ wait: true });
  await closeDb();
  return { workspace, campaign, recomputed: pass.recomputed };
}
