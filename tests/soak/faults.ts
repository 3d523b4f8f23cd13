/**
 * `npm run soak:faults [-- --minutes 5]`: the fault script. On a stack of its own (PostgreSQL with
 * fsync on, the production app, the mail catcher, worker processes), one after the other:
 *   a. PostgreSQL stopped (fast, immediate) and crash-restarted under pipelines streaming batches;
 *      every failed batch is retried with its Idempotency-Key; the database is checked row by row;
 *   b. the worker SIGKILLed in the middle of a recompute pass over many campaigns, then run again;
 *   c. SMTP down while alerts go out, then up again: each alert delivered exactly once;
 *   d. the app SIGKILLed and started again on the same port under a running worker.
 * Prints pass/fail with figures per scenario, writes tests/soak/results/faults.json, exits non-zero
 * on any failure and stops everything it started (also on Ctrl-C). The build folder is
 * NEXT_DIST_DIR (default .next-faults), built when a source is newer than it.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import pg from "pg";
import { createBenchCampaign, createBenchWorkspace, machineLine, type BenchWorkspace } from "../../bench/lib/stack";
import { startFaultStack, waitFor, type FaultStack, type WorkerProcess } from "../faults/lib/fault-stack";
import { batchSource, checkStored, isCleanProblem, launchCampaigns, percentile, retryFailed, runPipelines, sendBatch, type BatchRecord, type IngestRow } from "../faults/lib/pipelines";

const { values } = parseArgs({ options: { minutes: { type: "string", default: "5" }, only: { type: "string", default: "abcd" }, rebuild: { type: "boolean", default: false }, "reuse-build": { type: "boolean", default: false } }, strict: true });
const minutes = Math.min(10, Math.max(1, Number(values.minutes)));
const deadline = Date.now() + minutes * 60_000;
const rounds = Math.max(1, Math.min(5, Math.floor(minutes / 2)));
const log = (message: string) => process.stderr.write(`[faults] ${message}\n`);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

interface Scenario {
  name: string;
  pass: boolean;
  figures: Record<string, unknown>;
  failures: string[];
  seconds: number;
}

/** Collects failed expectations of a scenario instead of stopping at the first. */
class Checks {
  readonly failures: string[] = [];
  expect(ok: boolean, what: string): void {
    if (!ok) this.failures.push(what);
  }
}

function passesDone(worker: WorkerProcess, from = 0): Record<string, unknown>[] {
  return worker.lines.slice(from).filter((line) => line.msg === "recompute pass done");
}

function errorLines(worker: WorkerProcess): Record<string, unknown>[] {
  return worker.lines.filter((line) => Number(line.level) >= 50);
}

async function stopWorker(worker: WorkerProcess): Promise<number | null> {
  if (worker.child.exitCode === null && worker.child.signalCode === null) worker.child.kill("SIGTERM");
  return worker.exited;
}

async function ownCampaigns(faults: FaultStack, workspace: BenchWorkspace, count: number, days: number, first: number): Promise<string[]> {
  const ids: string[] = [];
  for (let index = 0; index < count; index += 4) {
    const made = await Promise.all(Array.from({ length: Math.min(4, count - index) }, (_, i) => createBenchCampaign(workspace.admin, first + index + i, days)));
    ids.push(...made.map((campaign) => campaign.id));
  }
  await launchCampaigns(faults.databaseUrl, ids);
  return ids;
}

/** a. PostgreSQL restarted under streaming pipelines. */
async function postgresRestarts(faults: FaultStack, workspace: BenchWorkspace, records: BatchRecord[]): Promise<Omit<Scenario, "name" | "seconds">> {
  const checks = new Checks();
  const pipelines = workspace.keys.length;
  const sources = [];
  for (let p = 0; p < pipelines; p++) {
    const ids = await ownCampaigns(faults, workspace, 12 * rounds + 4, 300, p * 1000);
    sources.push(batchSource(ids.map((id) => ({ id, days: 300 })), 25));
  }
  const worker = faults.spawnWorker([], { RECOMPUTE_CRON: "*/3 * * * * *", MAILER_CRON: "*/10 * * * * *" });
  await waitFor("the worker's first pass", () => passesDone(worker).length > 0, 60_000);
  const appPid = faults.app().child.pid;
  let phase = "before";
  let streamingDone = false;
  const streaming = runPipelines({ appUrl: faults.appUrl, keys: workspace.keys, sources, until: () => streamingDone, phase: () => phase, pauseMs: 20, records });
  const recovery: Record<string, number> = {};
  const firstAcknowledgedAfter = async (label: string, since: number) => {
    await waitFor(`an acknowledged batch after ${label}`, () => records.some((batch) => batch.attempts.some((a) => a.phase === label && a.status === 200)), 30_000).catch(() => undefined);
    recovery[label] = Date.now() - since;
  };
  for (let round = 1; round <= rounds; round++) {
    for (const kind of ["fast stop", "immediate stop", "crash restart"] as const) {
      await sleep(1_500);
      phase = `${kind} #${round}`;
      log(`${phase}: ${records.length} batches sent so far, ${records.filter((b) => !b.acknowledged).length} of them failed`);
      faults.stopPostgres(kind === "fast stop" ? "fast" : "immediate");
      if (kind !== "crash restart") await sleep(1_500);
      const started = Date.now();
      await faults.startPostgres();
      const label = `after ${kind} #${round}`;
      phase = label;
      await firstAcknowledgedAfter(label, started);
    }
  }
  await sleep(1_500);
  streamingDone = true;
  await streaming;

  const firstAttempts = records.flatMap((batch) => batch.attempts);
  const failed = firstAttempts.filter((attempt) => attempt.status !== 200);
  const byStatus: Record<string, number> = {};
  for (const attempt of failed) byStatus[attempt.status ?? "dropped"] = (byStatus[attempt.status ?? "dropped"] ?? 0) + 1;
  const fourHundreds = failed.filter((a) => a.status !== null && a.status < 500);
  const unclean = failed.filter((a) => a.status !== null && a.status >= 500 && !isCleanProblem(a.problem));
  checks.expect(failed.length > 0, "no batch failed: the restarts did not hit the stream");
  checks.expect(fourHundreds.length === 0, `${fourHundreds.length} batches were refused with a 4xx during the restarts, e.g. ${JSON.stringify(fourHundreds[0]?.problem)}`);
  checks.expect(unclean.length === 0, `${unclean.length} 5xx bodies are not clean RFC 9457 problems, e.g. ${JSON.stringify(unclean[0]?.problem)}`);
  const failedBatches = records.filter((batch) => !batch.acknowledged).length;
  await retryFailed(faults.appUrl, workspace.keys, records, Date.now() + 60_000);
  checks.expect(records.every((batch) => batch.acknowledged), `${records.filter((b) => !b.acknowledged).length} batches still failing after 60 s of retries`);
  const attempts = records.flatMap((batch) => batch.attempts);
  const stored = await checkStored(faults.databaseUrl, records);
  checks.expect(stored.rowsLost === 0, `${stored.rowsLost} acknowledged rows lost or changed: ${stored.samples.join("; ")}`);
  checks.expect(stored.duplicates === 0 && stored.revisions === 0, `${stored.duplicates} duplicate batches or rows, ${stored.revisions} revisions: ${stored.samples.join("; ")}`);
  checks.expect(stored.strayRows === 0, `${stored.strayRows} rows in the database no batch sent`);
  checks.expect(faults.app().child.pid === appPid && faults.app().child.exitCode === null, "the app process did not survive the restarts");
  const passesBefore = passesDone(worker).length;
  await waitFor("a worker pass after the restarts", () => passesDone(worker, 0).length > passesBefore, 30_000).catch(() => undefined);
  const lastPass = passesDone(worker).at(-1);
  checks.expect(worker.child.exitCode === null, `the worker died during the restarts: ${worker.stderr().slice(0, 1200)} ${JSON.stringify(errorLines(worker).slice(-2))}`);
  checks.expect(passesDone(worker).length > passesBefore && Number(lastPass?.failed ?? 1) === 0, `the worker's pass after the restarts did not succeed: ${JSON.stringify(lastPass)}`);
  await stopWorker(worker);
  const latencies = attempts.filter((a) => a.status === 200).map((a) => a.latencyMs);
  return {
    pass: checks.failures.length === 0,
    failures: checks.failures,
    figures: {
      pipelines,
      rounds,
      restarts: rounds * 3,
      batches: records.length,
      attempts: attempts.length,
      failedAttemptsByStatus: byStatus,
      batchesFailedFirstTime: failedBatches,
      retriesUntilAcknowledged: attempts.filter((a) => a.phase === "retry").length,
      recoveryMsAfterStart: recovery,
      acknowledgedBatchLatencyMs: { p50: Math.round(percentile(latencies, 0.5)), p99: Math.round(percentile(latencies, 0.99)) },
      rowsAcknowledged: stored.rowsAcknowledged,
      rowsStored: stored.rowsStored,
      rowsLost: stored.rowsLost,
      duplicates: stored.duplicates,
      revisions: stored.revisions,
      strayRows: stored.strayRows,
      appPidUnchanged: faults.app().child.pid === appPid,
      workerPassesDuring: passesDone(worker).length,
      workerErrorLines: errorLines(worker).length,
    },
  };
}

/** b. The worker SIGKILLed mid-pass over many campaigns. */
async function workerKilled(faults: FaultStack, workspace: BenchWorkspace): Promise<Omit<Scenario, "name" | "seconds">> {
  const checks = new Checks();
  const campaignCount = 120;
  const days = 40;
  const ids = await ownCampaigns(faults, workspace, campaignCount, days, 50_000);
  const source = batchSource(ids.map((id) => ({ id, days })), days);
  const batches: BatchRecord[] = [];
  for (let rows = source(); rows; rows = source()) {
    const batch: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows, attempts: [], acknowledged: false };
    batches.push(batch);
    await sendBatch(faults.appUrl, workspace.keys[0], batch, "counts");
  }
  checks.expect(batches.every((batch) => batch.acknowledged), "the counts for the recompute did not all go in");
  const killed = faults.spawnWorker(["--once", "--job", "recompute"], { RECOMPUTE_HOLD_MS: "40" });
  const recomputedLines = () => killed.lines.filter((line) => line.msg === "campaign recomputed").length;
  await waitFor("the worker to be a third of the way through", () => recomputedLines() >= campaignCount / 3 || killed.child.exitCode !== null, 120_000);
  const doneBeforeKill = recomputedLines();
  killed.child.kill("SIGKILL");
  await killed.exited;
  checks.expect(doneBeforeKill < campaignCount, "the pass ended before it could be killed");

  const pool = new pg.Pool({ connectionString: faults.databaseUrl, max: 1 });
  const analysed = async () => {
    const { rows } = await pool.query<{ id: string; days: number }>(
      "select c.id, (select count(*)::int from analysis_days d where d.campaign_id = c.id) as days from campaigns c where c.id = any($1)",
      [ids],
    );
    return rows;
  };
  try {
    const afterKill = await analysed();
    const half = afterKill.filter((row) => row.days !== 0 && row.days !== days);
    const complete = afterKill.filter((row) => row.days === days).length;
    checks.expect(half.length === 0, `${half.length} campaigns half-written after the kill (${JSON.stringify(half.slice(0, 3))})`);
    // The killed backend's session lock goes with its connection; the next pass must not skip.
    let skippedRuns = 0;
    let next: WorkerProcess;
    const lockStarted = Date.now();
    for (;;) {
      next = faults.spawnWorker(["--once", "--job", "recompute"]);
      const code = await next.exited;
      const skipped = next.lines.some((line) => line.skipped === true);
      if (!skipped || Date.now() - lockStarted > 10_000) {
        checks.expect(code === 0, `the next pass exited ${code}: ${next.stderr().slice(0, 300)}`);
        break;
      }
      skippedRuns += 1;
      await sleep(500);
    }
    const nextPass = passesDone(next).at(-1);
    checks.expect(skippedRuns === 0, `the next pass found the lock held ${skippedRuns} times after the kill`);
    checks.expect(Number(nextPass?.failed ?? 1) === 0, `the next pass reported failures: ${JSON.stringify(nextPass)}`);
    const afterNext = await analysed();
    const incomplete = afterNext.filter((row) => row.days !== days);
    checks.expect(incomplete.length === 0, `${incomplete.length} campaigns not fully analysed after the next pass`);
    const { rows: locks } = await pool.query<{ n: number }>("select count(*)::int as n from pg_locks where locktype = 'advisory'");
    checks.expect(locks[0].n === 0, `${locks[0].n} advisory locks still held after both passes`);
    return {
      pass: checks.failures.length === 0,
      failures: checks.failures,
      figures: {
        campaigns: campaignCount,
        daysEach: days,
        recomputedBeforeKill: doneBeforeKill,
        completeAfterKill: complete,
        halfWrittenAfterKill: half.length,
        nextPassRecomputed: Number(nextPass?.recomputed ?? 0),
        nextPassSkippedForLock: skippedRuns,
        incompleteAfterNextPass: incomplete.length,
        advisoryLocksLeft: locks[0].n,
      },
    };
  } finally {
    await pool.end();
  }
}

function liftingRows(campaignId: string, days: number): IngestRow[] {
  const rows: IngestRow[] = [];
  for (let d = 0; d < days; d++) {
    const date = new Date(Date.now() - (days - d) * 86_400_000).toISOString().slice(0, 10);
    rows.push({ campaign: campaignId, arm: "holdout", date, units: 2_000, conversions: 100 + (d % 3) });
    rows.push({ campaign: campaignId, arm: "treatment", date, units: 18_000, conversions: 1_500 + (d % 5) });
  }
  return rows;
}

/** c. SMTP down while alerts go out. */
async function smtpDown(faults: FaultStack, workspace: BenchWorkspace): Promise<Omit<Scenario, "name" | "seconds">> {
  const checks = new Checks();
  const [campaignId] = await ownCampaigns(faults, workspace, 1, 12, 90_000);
  const campaign = { id: campaignId };
  const pool = new pg.Pool({ connectionString: faults.databaseUrl, max: 1 });
  const deliveries = async () =>
    (
      await pool.query<{ id: string; sent_at: Date | null; attempts: number; last_error: string | null; next_attempt_at: Date }>(
        "select d.id, d.sent_at, d.attempts, d.last_error, d.next_attempt_at from alert_deliveries d join alerts a on a.id = d.alert_id where a.campaign_id = $1",
        [campaign.id],
      )
    ).rows;
  try {
    // Settle every earlier campaign's mail first, so the passes below concern this campaign only.
    await faults.spawnWorker(["--once", "--job", "recompute", "--job", "mailer"]).exited;
    await faults.stopSmtp();
    const batch: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows: liftingRows(campaign.id, 12), attempts: [], acknowledged: false };
    await sendBatch(faults.appUrl, workspace.keys[0], batch, "counts");
    checks.expect(batch.acknowledged, "the lifting counts were not accepted");
    const down = faults.spawnWorker(["--once", "--job", "recompute", "--job", "mailer"]);
    await down.exited;
    const afterDown = await deliveries();
    checks.expect(afterDown.length > 0, "no alert delivery was queued for the campaign");
    checks.expect(afterDown.every((d) => d.sent_at === null && d.attempts >= 1 && !!d.last_error), `deliveries while SMTP is down: ${JSON.stringify(afterDown)}`);
    const again = faults.spawnWorker(["--once", "--job", "mailer"]);
    await again.exited;
    const notDue = await deliveries();
    checks.expect(notDue.every((d, i) => d.attempts === afterDown[i].attempts && d.sent_at === null), "a pass before the backoff ended tried again (or sent with SMTP down)");
    await faults.startSmtp();
    const due = Math.max(...notDue.map((d) => d.next_attempt_at.getTime()));
    log(`SMTP back; waiting ${Math.max(0, Math.round((due - Date.now()) / 1000))} s for the retry backoff`);
    await sleep(Math.max(0, due - Date.now()) + 1_000);
    const up = faults.spawnWorker(["--once", "--job", "mailer"]);
    await up.exited;
    const once = faults.spawnWorker(["--once", "--job", "mailer"]);
    await once.exited;
    const afterUp = await deliveries();
    const messages = faults.mail().messages.filter((mail) => mail.headers["x-peeksafe-alert"] !== undefined);
    const perRecipient = new Map<string, number>();
    for (const mail of messages) for (const to of mail.envelopeTo) perRecipient.set(to, (perRecipient.get(to) ?? 0) + 1);
    checks.expect(afterUp.every((d) => d.sent_at !== null), `deliveries not sent after SMTP came back: ${JSON.stringify(afterUp.filter((d) => !d.sent_at))}`);
    checks.expect(messages.length === afterDown.length, `${messages.length} alert mails for ${afterDown.length} deliveries`);
    checks.expect([...perRecipient.values()].every((n) => n === 1), `a recipient got more than one mail: ${JSON.stringify([...perRecipient])}`);
    return {
      pass: checks.failures.length === 0,
      failures: checks.failures,
      figures: {
        deliveriesQueued: afterDown.length,
        attemptsWhileDown: afterDown.map((d) => d.attempts),
        lastError: afterDown[0]?.last_error ?? null,
        triedBeforeBackoffEnded: notDue.some((d, i) => d.attempts !== afterDown[i].attempts),
        mailsAfterSmtpBack: messages.length,
        recipients: perRecipient.size,
        mailsPerRecipient: [...new Set(perRecipient.values())],
      },
    };
  } finally {
    await pool.end();
  }
}

/** d. The app SIGKILLed and started again on the same port. */
async function appKilled(faults: FaultStack, workspace: BenchWorkspace, earlier: BatchRecord[]): Promise<Omit<Scenario, "name" | "seconds">> {
  const checks = new Checks();
  const [campaignId] = await ownCampaigns(faults, workspace, 1, 40, 95_000);
  const campaign = { id: campaignId };
  const next = batchSource([{ id: campaign.id, days: 40 }], 20);
  const worker = faults.spawnWorker([], { RECOMPUTE_CRON: "*/2 * * * * *", MAILER_CRON: "*/5 * * * * *" });
  await waitFor("the worker's first pass", () => passesDone(worker).length > 0, 60_000);
  const first: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows: next()!, attempts: [], acknowledged: false };
  await sendBatch(faults.appUrl, workspace.keys[0], first, "before kill");
  const killedPid = faults.app().child.pid;
  await faults.killApp();
  const refused = await fetch(`${faults.appUrl}/api/health`).then(() => false, () => true);
  const restartStarted = Date.now();
  await faults.startAppAgain();
  const restartMs = Date.now() - restartStarted;
  const session = await workspace.admin.json<{ user?: { email: string } } | null>("/api/auth/get-session");
  const listed = await workspace.admin.json("/api/v1/campaigns");
  const passesBefore = passesDone(worker).length;
  const second: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows: next()!, attempts: [], acknowledged: false };
  await sendBatch(faults.appUrl, workspace.keys[0], second, "after restart");
  const replay = await sendBatch(faults.appUrl, workspace.keys[0], first, "replay");
  const stored = await checkStored(faults.databaseUrl, [...earlier, first, second]);
  await waitFor("a worker pass over the counts sent after the restart", () => passesDone(worker, 0).slice(passesBefore).some((line) => Number(line.recomputed) >= 1), 30_000).catch(() => undefined);
  const resumed = passesDone(worker).slice(passesBefore).find((line) => Number(line.recomputed) >= 1);
  checks.expect(first.acknowledged, "the batch before the kill was not accepted");
  checks.expect(refused, "the app still answered after SIGKILL");
  checks.expect(faults.app().child.pid !== killedPid, "the app was not started again");
  checks.expect(session.status === 200 && !!session.body?.user, `the signed-in session did not survive: ${session.status}`);
  checks.expect(listed.status === 200 && JSON.stringify(listed.body).includes(campaign.id), `the session could not list the campaigns: ${listed.status}`);
  checks.expect(second.acknowledged, "the API key could not ingest after the restart");
  checks.expect(replay.status === 200, `the replay of a batch from before the kill answered ${replay.status}`);
  checks.expect(stored.rowsLost === 0 && stored.duplicates === 0 && stored.strayRows === 0, `data after the restart: ${JSON.stringify(stored)}`);
  checks.expect(worker.child.exitCode === null && !!resumed && Number(resumed.failed) === 0, `the worker did not resume: ${JSON.stringify(resumed)}`);
  checks.expect(errorLines(worker).length === 0, `the worker logged errors: ${JSON.stringify(errorLines(worker).slice(0, 2))}`);
  await stopWorker(worker);
  return {
    pass: checks.failures.length === 0,
    failures: checks.failures,
    figures: {
      restartMs,
      connectionRefusedWhileDown: refused,
      sessionStatus: session.status,
      campaignsStatus: listed.status,
      ingestAfterRestart: second.attempts.at(-1)?.status ?? null,
      replayStatus: replay.status,
      rowsChecked: stored.rowsAcknowledged,
      rowsLost: stored.rowsLost,
      workerResumed: !!resumed,
    },
  };
}

async function main(): Promise<void> {
  let faults: FaultStack | undefined;
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await faults?.stop();
  };
  process.once("SIGINT", () => {
    log("interrupted; stopping what was started");
    void stop().finally(() => process.exit(130));
  });
  const scenarios: Scenario[] = [];
  try {
    faults = await startFaultStack({ distDir: process.env.NEXT_DIST_DIR ?? ".next-faults", log });
    const workspace = await createBenchWorkspace(faults.appUrl, faults.databaseUrl, 4);
    const records: BatchRecord[] = [];
    const run = async (name: string, scenario: () => Promise<Omit<Scenario, "name" | "seconds">>) => {
      if (!values.only.includes(name[0])) return;
      if (Date.now() > deadline) {
        scenarios.push({ name, pass: false, figures: {}, failures: [`not run: the ${minutes}-minute budget ran out`], seconds: 0 });
        return;
      }
      const started = Date.now();
      log(`${name}…`);
      try {
        scenarios.push({ name, ...(await scenario()), seconds: Math.round((Date.now() - started) / 1000) });
      } catch (error) {
        scenarios.push({ name, pass: false, figures: {}, failures: [error instanceof Error ? error.message : String(error)], seconds: Math.round((Date.now() - started) / 1000) });
      }
      const last = scenarios.at(-1)!;
      console.log(`${last.pass ? "PASS" : "FAIL"}  ${name} (${last.seconds} s)  ${JSON.stringify(last.figures)}`);
      for (const failure of last.failures) console.log(`      - ${failure}`);
    };
    await run("a. PostgreSQL restarted under streaming ingest", () => postgresRestarts(faults!, workspace, records));
    await run("b. worker SIGKILLed mid-recompute", () => workerKilled(faults!, workspace));
    await run("c. SMTP down while alerts go out", () => smtpDown(faults!, workspace));
    await run("d. app SIGKILLed and started again", () => appKilled(faults!, workspace, records));
  } finally {
    await stop();
  }
  const passed = scenarios.filter((s) => s.pass).length;
  const folder = path.resolve("tests/soak/results");
  mkdirSync(folder, { recursive: true });
  const file = path.join(folder, "faults.json");
  writeFileSync(file, `${JSON.stringify({ soak: "faults", ranAt: new Date().toISOString(), minutes, machine: machineLine(), passed, failed: scenarios.length - passed, scenarios }, null, 2)}\n`);
  console.log(`\n${passed}/${scenarios.length} fault scenarios survived; wrote ${file}`);
  if (passed !== scenarios.length) process.exitCode = 1;
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
