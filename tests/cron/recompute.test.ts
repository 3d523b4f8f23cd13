import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { recomputeCampaign, runRecompute } from "@/cron/recompute";
import { getDb } from "@/db";
import { listAnalysisDays } from "@/db/queries/analysis";
import { listCampaignAlerts } from "@/db/queries/alerts";
import { campaigns } from "@/db/schema";
import {
  conversionCounts,
  createBareWorkspace,
  createWorkerCampaign,
  meanCounts,
  putCounts,
  type CountInput,
  type WorkerCampaign,
} from "../helpers/worker-fixtures";

const folder = mkdtempSync(path.join(os.tmpdir(), "peeksafe-worker-test-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

/** Runs `npm run peeksafe -- analyze` (the command line, as a user would) on the same counts and plan. */
function cliAnalyze(campaign: WorkerCampaign, rows: CountInput[]): Promise<CliAnalysis> {
  const file = path.join(folder, `${campaign.id}.csv`);
  const mean = campaign.input.metricKind === "mean";
  const header = mean ? "date,arm,units,sum,sum_squares" : "date,arm,units,conversions";
  const order = new Map(campaign.input.arms.map((arm, index) => [arm.key, index]));
  const sorted = [...rows].sort((a, b) => a.date.localeCompare(b.date) || order.get(a.arm)! - order.get(b.arm)!);
  const lines = sorted.map((row) => (mean ? `${row.date},${row.arm},${row.n},${row.sum},${row.sumSq}` : `${row.date},${row.arm},${row.n},${row.sum}`));
  writeFileSync(file, [header, ...lines].join("\n") + "\n");
  const holdout = campaign.input.arms.find((arm) => arm.key === "holdout")!;
  const args = [
    "bin/peeksafe.ts", "analyze", "--counts", file,
    "--alpha", String(campaign.input.alpha), "--tau", String(campaign.tau),
    "--baseline", String(mean ? campaign.input.baselineMean : campaign.input.baselineRate),
    "--mde", String(campaign.input.minimumLift), "--power", String(campaign.input.power),
    "--sides", String(campaign.input.sides), "--max-days", String(campaign.input.maxDays),
    "--holdout-share", String(holdout.share),
    ...(mean ? ["--sd", String(campaign.input.baselineSd)] : []),
  ];
  return new Promise((resolve, reject) => {
    const child = spawn(path.resolve("node_modules/.bin/tsx"), args, { stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    let err = "";
    child.stdout.on("data", (chunk) => (out += chunk));
    child.stderr.on("data", (chunk) => (err += chunk));
    child.on("exit", (code) => (code === 0 ? resolve(JSON.parse(out)) : reject(new Error(`peeksafe analyze exited ${code}: ${err}`))));
  });
}

interface CliDay {
  date: string;
  dayNumber: number;
  call: string;
  lift: { absolute: number | null; relative: number | null };
  fixed: { z: number | null; p: number | null; ci: [number | null, number | null] | null };
  sequential: { p: number; cs: [number | null, number | null] };
  health: { srm: { chiSquare: { p: number } | null; sequential: { p: number } | null } };
  byArm: Record<string, unknown>;
  leadingArm: string;
}
interface CliAnalysis {
  days: CliDay[];
  peekingCost: number | null;
}

function openAsNull(value: number | null): number | null {
  return value !== null && !Number.isFinite(value) ? null : value;
}

async function expectSameAsCli(campaign: WorkerCampaign, rows: CountInput[]) {
  const cli = await cliAnalyze(campaign, rows);
  const stored = await listAnalysisDays(campaign.id);
  expect(stored.map((day) => day.day)).toEqual(cli.days.map((day) => day.date));
  cli.days.forEach((expected, index) => {
    const day = stored[index];
    // Exactly the same numbers: the same function on the same counts, float8 round trip is exact.
    expect({
      daysRun: day.daysRun,
      call: day.call,
      liftAbsolute: day.liftAbsolute,
      liftRelative: day.liftRelative,
      // The command line prints an open (±Infinity) interval end as null.
      sequence: [openAsNull(day.sequenceLow), openAsNull(day.sequenceHigh)],
      interval: day.intervalLow === null ? null : [openAsNull(day.intervalLow), openAsNull(day.intervalHigh)],
      fixedZ: day.fixedZ,
      fixedP: day.fixedP,
      sequentialP: day.sequentialP,
      srmP: day.srmP,
      srmSequentialP: day.srmSequentialP,
      leadingArm: (day.detail as { leadingArm: string }).leadingArm,
      byArm: (day.detail as { byArm: unknown }).byArm,
    }).toEqual({
      daysRun: expected.dayNumber,
      call: expected.call,
      liftAbsolute: expected.lift.absolute,
      liftRelative: expected.lift.relative,
      sequence: expected.sequential.cs,
      interval: expected.fixed.ci,
      fixedZ: expected.fixed.z,
      fixedP: expected.fixed.p,
      sequentialP: expected.sequential.p,
      srmP: expected.health.srm.chiSquare?.p ?? null,
      srmSequentialP: expected.health.srm.sequential?.p ?? null,
      leadingArm: expected.leadingArm,
      byArm: expected.byArm,
    });
  });
  expect(stored.at(-1)!.peekingCost).toBe(cli.peekingCost);
  // Peeking cost so far never falls from one day to the next (more looks, more chances to fire).
  const costs = stored.map((day) => day.peekingCost).filter((cost): cost is number => cost !== null);
  costs.slice(1).forEach((cost, index) => expect(cost).toBeGreaterThanOrEqual(costs[index] - 1e-12));
}

/** Spawns `tsx cron/index.ts --once` and collects its JSON log lines. */
function spawnWorker(args: string[], env: Record<string, string> = {}) {
  // One process (node with the tsx loader), so a SIGKILL really kills the worker and its connections.
  const child = spawn(process.execPath, ["--import", "tsx", "cron/index.ts", "--once", ...args], {
    env: { ...process.env, LOG_LEVEL: "info", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  const lines: Record<string, unknown>[] = [];
  let buffer = "";
  child.stdout.on("data", (chunk: Buffer) => {
    buffer += chunk.toString();
    const parts = buffer.split("\n");
    buffer = parts.pop()!;
    for (const part of parts) if (part.trim()) lines.push(JSON.parse(part));
  });
  let stderr = "";
  child.stderr.on("data", (chunk) => (stderr += chunk));
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
  return { child, lines, exited, stderr: () => stderr };
}

async function waitFor(predicate: () => boolean, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  while (!predicate()) {
    if (Date.now() > deadline) throw new Error("condition not met in time");
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

describe("the recompute worker", () => {
  it("stores exactly the numbers of `peeksafe analyze` for conversion, mean and three-arm campaigns", async () => {
    const workspaceId = await createBareWorkspace();
    const twoArm = await createWorkerCampaign({ workspaceId, createdBy: null });
    const twoArmRows = conversionCounts(9, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.064 } });
    await putCounts(twoArm, twoArmRows);

    const mean = await createWorkerCampaign({ workspaceId, createdBy: null, metricKind: "mean", name: "Tent promo order value", minimumLift: 0.05 });
    const meanRows = meanCounts(8, { holdout: { units: 1500, mean: 4.2, sd: 18 }, treatment: { units: 1500, mean: 4.6, sd: 18.5 } });
    await putCounts(mean, meanRows);

    const threeArm = await createWorkerCampaign({
      workspaceId,
      createdBy: null,
      name: "Rain jacket push test",
      sides: 1,
      arms: [
        { key: "holdout", name: "Holdout", share: 0.4 },
        { key: "treatment", name: "Push at noon", share: 0.3 },
        { key: "variant-b", name: "Push at six", share: 0.3 },
      ],
    });
    const threeArmRows = conversionCounts(10, {
      holdout: { units: 1600, rate: 0.05 },
      treatment: { units: 1200, rate: 0.052 },
      "variant-b": { units: 1200, rate: 0.045 },
    });
    await putCounts(threeArm, threeArmRows);

    const summary = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(summary.ran).toBe(true);
    const ids = summary.campaigns.filter((c) => c.recomputed).map((c) => c.campaignId);
    expect(ids).toEqual(expect.arrayContaining([twoArm.id, mean.id, threeArm.id]));

    await expectSameAsCli(twoArm, twoArmRows);
    await expectSameAsCli(mean, meanRows);
    await expectSameAsCli(threeArm, threeArmRows);
    const [stored] = await getDb().select().from(campaigns).where(eq(campaigns.id, twoArm.id));
    expect(stored.analyzedAt).not.toBeNull();
    expect(stored.currentCall).toBe((await listAnalysisDays(twoArm.id)).at(-1)!.call);
  });

  it("does not recompute a campaign whose counts did not change, and re-queues no alert", async () => {
    const workspaceId = await createBareWorkspace();
    const campaign = await createWorkerCampaign({ workspaceId, createdBy: null });
    await putCounts(campaign, conversionCounts(6, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.066 } }));
    const first = await recomputeCampaign(campaign.id);
    expect(first.recomputed).toBe(true);
    expect(first.call).toBe("lift");
    const before = await listAnalysisDays(campaign.id);

    const again = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(again.campaigns.find((c) => c.campaignId === campaign.id)).toBeUndefined();
    const nightly = await runRecompute({ all: true, workspaceIds: [workspaceId], wait: true });
    expect(nightly.campaigns).toEqual([expect.objectContaining({ campaignId: campaign.id, recomputed: false })]);
    const after = await listAnalysisDays(campaign.id);
    expect(after.map((day) => [day.id, day.computedAt.getTime()])).toEqual(before.map((day) => [day.id, day.computedAt.getTime()]));
    expect(await listCampaignAlerts(campaign.id)).toHaveLength(1);
  });

  it("lets one of two workers started at once recompute; the other skips and says so", async () => {
    const workspaceId = await createBareWorkspace();
    const campaign = await createWorkerCampaign({ workspaceId, createdBy: null });
    await putCounts(campaign, conversionCounts(5, { holdout: { units: 1000, rate: 0.05 }, treatment: { units: 1000, rate: 0.05 } }));
    const env = { RECOMPUTE_HOLD_MS: "4000" };
    const a = spawnWorker(["--job", "recompute"], env);
    const b = spawnWorker(["--job", "recompute"], env);
    const codes = await Promise.all([a.exited, b.exited]);
    expect(codes, a.stderr() + b.stderr()).toEqual([0, 0]);
    const recomputed = [a, b].filter((w) => w.lines.some((line) => line.msg === "campaign recomputed" && line.campaignId === campaign.id));
    const skipped = [a, b].filter((w) => w.lines.some((line) => line.skipped === true && line.job === "recompute"));
    expect(recomputed).toHaveLength(1);
    expect(skipped).toHaveLength(1);
    expect(skipped[0]).not.toBe(recomputed[0]);
    const line = recomputed[0].lines.find((l) => l.msg === "campaign recomputed" && l.campaignId === campaign.id)!;
    expect(line).toMatchObject({ campaignId: campaign.id, days: 5, call: expect.any(String), durationMs: expect.any(Number) });
    expect(await listAnalysisDays(campaign.id)).toHaveLength(5);
  });

  it("keeps the previous analysis when a worker is killed mid-recompute; the next run completes it", async () => {
    const workspaceId = await createBareWorkspace();
    const campaign = await createWorkerCampaign({ workspaceId, createdBy: null });
    await putCounts(campaign, conversionCounts(3, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } }));
    await recomputeCampaign(campaign.id);
    const before = await listAnalysisDays(campaign.id);
    const [{ analysisInputsHash: hashBefore }] = await getDb().select().from(campaigns).where(eq(campaigns.id, campaign.id));
    await putCounts(campaign, conversionCounts(4, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } }, 3));

    const worker = spawnWorker(["--job", "recompute"], { RECOMPUTE_HOLD_MS: "60000" });
    await waitFor(() => worker.lines.some((line) => line.msg === "holding the recompute transaction open before commit" && line.campaignId === campaign.id));
    worker.child.kill("SIGKILL");
    await worker.exited;

    const kept = await listAnalysisDays(campaign.id);
    expect(kept.map((day) => [day.id, day.day, day.sequentialP])).toEqual(before.map((day) => [day.id, day.day, day.sequentialP]));
    const [{ analysisInputsHash: hashKept }] = await getDb().select().from(campaigns).where(eq(campaigns.id, campaign.id));
    expect(hashKept).toBe(hashBefore);

    const next = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(next.campaigns.find((c) => c.campaignId === campaign.id)).toMatchObject({ recomputed: true, days: 7 });
    expect(await listAnalysisDays(campaign.id)).toHaveLength(7);
  });
});
