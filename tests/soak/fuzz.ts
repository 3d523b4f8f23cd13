import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import fc from "fast-check";
import { printTable } from "../../bench/lib/stack";
import { dumpProductTables } from "../factories-campaigns";
import { actionArbitraries, checkActionCase, createActionFuzzWorld } from "../helpers/action-arbitraries";
import { checkCsvCase, checkIngestCase, createIngestFuzzWorld, ingestArbitraries } from "../helpers/ingest-arbitraries";
import { checkRouteCase, createRouteFuzzWorld, routeArbitraries } from "../helpers/route-arbitraries";
import { provideTestContext } from "./lib/provide";
import { SOAK_DIST_DIR, startSoakStack } from "./lib/stack";

// The long form of the bad-input fuzz (issue 7): `npm run soak:fuzz [-- --runs N --seed S --minutes M]`.
// Its own PostgreSQL, mail catcher and production app; the same generators and checks as `npm test`.

const { values: options } = parseArgs({
  options: {
    runs: { type: "string", default: "10000" },
    seed: { type: "string", default: "20260701" },
    minutes: { type: "string", default: "20" },
    rebuild: { type: "boolean", default: false },
    "reuse-build": { type: "boolean", default: false },
    only: { type: "string", default: "ingest,csv,routes,actions" },
  },
});
const runs = Number(options.runs);
const seed = Number(options.seed);
const minutes = Number(options.minutes);
const only = new Set(options.only.split(","));
if (!Number.isInteger(runs) || runs < 1 || !Number.isInteger(seed) || !(minutes > 0)) {
  console.error("usage: npm run soak:fuzz -- [--runs N] [--seed S] [--minutes M] [--only ingest,csv,routes,actions] [--rebuild | --reuse-build]");
  process.exit(2);
}

interface TargetResult {
  target: string;
  planned: number;
  tried: number;
  "4xx": number;
  "5xx": number;
  failures: number;
  seconds: number;
  perSecond: number;
  interrupted: boolean;
  counterexample?: string;
  error?: string;
}

/** Runs one property for up to `numRuns` cases or `budgetMs`, counting the statuses the checks return. */
async function runTarget<T>(target: string, arbitrary: fc.Arbitrary<T>, check: (value: T) => Promise<number>, numRuns: number, budgetMs: number): Promise<TargetResult> {
  const counts = { tried: 0, clientErrors: 0, serverErrors: 0 };
  const started = performance.now();
  const details = await fc.check(
    fc.asyncProperty(arbitrary, async (value) => {
      counts.tried += 1;
      try {
        const status = await check(value);
        if (status >= 400 && status < 500) counts.clientErrors += 1;
      } catch (error) {
        if (/\b(got|no) 5\d\d\b|expected no 5xx, got/.test(String(error))) counts.serverErrors += 1;
        throw error;
      }
    }),
    { seed, numRuns, endOnFailure: true, interruptAfterTimeLimit: budgetMs, markInterruptAsFailure: false },
  );
  const seconds = (performance.now() - started) / 1000;
  const result: TargetResult = {
    target,
    planned: numRuns,
    tried: counts.tried,
    "4xx": counts.clientErrors,
    "5xx": counts.serverErrors,
    failures: details.failed ? 1 : 0,
    seconds: Math.round(seconds * 10) / 10,
    perSecond: Math.round(counts.tried / seconds),
    interrupted: details.interrupted,
  };
  if (details.failed) {
    result.counterexample = JSON.stringify(clipForReport(details.counterexample));
    result.error = String(details.errorInstance).slice(0, 2000);
  }
  process.stderr.write(`[fuzz] ${target}: ${counts.tried} cases in ${result.seconds} s (${result.perSecond}/s)${details.failed ? " FAILED" : ""}\n`);
  return result;
}

/** A counterexample small enough to print: long strings and bytes summarised, nesting cut at 20 levels. */
function clipForReport(value: unknown, depth = 0): unknown {
  if (typeof value === "string") return value.length > 300 ? `${value.slice(0, 300)}… (${value.length} chars)` : value;
  if (value instanceof Uint8Array) return `bytes(${value.length})`;
  if (depth >= 20) return "… (nested deeper)";
  if (Array.isArray(value)) return value.map((item) => clipForReport(item, depth + 1));
  if (value && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([key, item]) => [key, clipForReport(item, depth + 1)]));
  return value;
}

async function main(): Promise<number> {
  const deadline = Date.now() + minutes * 60_000;
  const stack = await startSoakStack({ app: true });
  try {
    Object.assign(process.env, stack.env);
    provideTestContext({ appUrl: stack.appUrl!, databaseUrl: stack.databaseUrl, mailUrl: stack.env.MAIL_CATCHER_URL!, smtpUrl: stack.env.SMTP_URL!, authSecret: stack.env.BETTER_AUTH_SECRET! });
    const appUrl = stack.appUrl!;
    const [ingestWorld, routeWorld, actionWorld] = await Promise.all([createIngestFuzzWorld(appUrl), createRouteFuzzWorld(appUrl), createActionFuzzWorld(appUrl, SOAK_DIST_DIR)]);
    const ingest = ingestArbitraries(ingestWorld);
    const before = await dumpProductTables();

    const plan = [
      { key: "ingest", target: "POST /api/v1/ingest", runs, weight: 10, run: (n: number, ms: number) => runTarget("POST /api/v1/ingest", ingest.ingestCase, (c) => checkIngestCase(ingestWorld, c), n, ms) },
      { key: "csv", target: "CSV upload", runs, weight: 10, run: (n: number, ms: number) => runTarget("CSV upload", ingest.csvCase, (c) => checkCsvCase(ingestWorld, c), n, ms) },
      { key: "routes", target: "REST routes", runs: Math.ceil(runs / 2), weight: 4, run: (n: number, ms: number) => runTarget("REST routes", routeArbitraries(routeWorld).routeCase, (c) => checkRouteCase(routeWorld, c), n, ms) },
      { key: "actions", target: "server actions", runs: Math.ceil(runs / 5), weight: 6, run: (n: number, ms: number) => runTarget("server actions", actionArbitraries(actionWorld).actionCase, (c) => checkActionCase(actionWorld, c), n, ms) },
    ].filter((step) => only.has(step.key));
    const results: TargetResult[] = [];
    for (const [index, step] of plan.entries()) {
      // Each target gets its share of what is left of the time cap, so one slow target cannot starve the rest.
      const weightLeft = plan.slice(index).reduce((sum, next) => sum + next.weight, 0);
      const budgetMs = Math.max(5_000, ((deadline - Date.now()) * step.weight) / weightLeft);
      results.push(await step.run(step.runs, budgetMs));
    }
    const tablesUnchanged = (await dumpProductTables()) === before;

    console.log(`\nfuzz soak, seed ${seed}, up to ${runs} cases per ingest target, cap ${minutes} min`);
    printTable(results.map((row) => ({ target: row.target, tried: row.tried, planned: row.planned, "4xx": row["4xx"], "5xx": row["5xx"], failures: row.failures, seconds: row.seconds, "per s": row.perSecond })));
    console.log(`product tables unchanged: ${tablesUnchanged ? "yes" : "NO"}`);
    for (const row of results.filter((result) => result.failures > 0)) {
      console.log(`\n${row.target} failed (seed ${seed}):\n  counterexample: ${row.counterexample}\n  ${row.error}`);
    }
    const folder = path.resolve("tests/soak/results");
    mkdirSync(folder, { recursive: true });
    const summary = { seed, runs, minutes, finishedAt: new Date().toISOString(), tablesUnchanged, targets: results };
    writeFileSync(path.join(folder, "fuzz.json"), `${JSON.stringify(summary, null, 2)}\n`);
    console.log(`\nwrote tests/soak/results/fuzz.json`);
    const failed = !tablesUnchanged || results.some((row) => row.failures > 0 || row["5xx"] > 0);
    return failed ? 1 : 0;
  } finally {
    await stack.stop();
  }
}

main().then(
  (code) => process.exit(code),
  (error) => {
    console.error(error);
    process.exit(1);
  },
);
