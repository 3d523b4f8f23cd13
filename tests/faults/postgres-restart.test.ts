import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createBenchCampaign, createBenchWorkspace, type BenchWorkspace } from "../../bench/lib/stack";
import { startFaultStack, type FaultStack } from "./lib/fault-stack";
import { batchSource, checkStored, isCleanProblem, retryFailed, runPipelines, type BatchRecord } from "./lib/pipelines";

// Its own PostgreSQL (fsync on) and app: this file stops the database under the app.
let faults: FaultStack;
let workspace: BenchWorkspace;
const sharedDatabaseUrl = process.env.DATABASE_URL;

beforeAll(async () => {
  faults = await startFaultStack({ distDir: process.env.NEXT_DIST_DIR ?? ".next", reuseBuild: true });
  workspace = await createBenchWorkspace(faults.appUrl, faults.databaseUrl, 3);
}, 120_000);
afterAll(async () => {
  await faults?.stop();
  process.env.DATABASE_URL = sharedDatabaseUrl;
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

describe("PostgreSQL restarted under a stream of ingest batches", () => {
  it("keeps every acknowledged batch, answers the rest with a clean 5xx or a dropped connection, and takes their retries once", async () => {
    const sources = [];
    for (let pipeline = 0; pipeline < workspace.keys.length; pipeline++) {
      const owned = [];
      for (let c = 0; c < 2; c++) owned.push({ id: (await createBenchCampaign(workspace.admin, pipeline * 2 + c, 300)).id, days: 300 });
      sources.push(batchSource(owned, 5));
    }
    const appPid = faults.app().child.pid;
    const records: BatchRecord[] = [];
    let phase = "before";
    let done = false;
    const streaming = runPipelines({ appUrl: faults.appUrl, keys: workspace.keys, sources, until: () => done, phase: () => phase, pauseMs: 20, records });

    await sleep(800);
    phase = "fast stop";
    faults.stopPostgres("fast");
    await sleep(700);
    await faults.startPostgres();
    phase = "after fast stop";
    await sleep(800);
    phase = "immediate stop";
    faults.stopPostgres("immediate");
    await sleep(700);
    await faults.startPostgres();
    phase = "after immediate stop";
    await sleep(1_000);
    done = true;
    await streaming;

    const attempts = records.flatMap((batch) => batch.attempts);
    const failed = attempts.filter((attempt) => attempt.status !== 200);
    // The faults really happened while batches were going in, and batches got through on both sides of them.
    expect(failed.length).toBeGreaterThan(0);
    expect(attempts.filter((a) => a.phase === "before" && a.status === 200).length).toBeGreaterThan(0);
    expect(attempts.filter((a) => a.phase === "after immediate stop" && a.status === 200).length).toBeGreaterThan(0);
    for (const attempt of failed) {
      if (attempt.status === null) continue;
      expect(attempt.status, JSON.stringify(attempt.problem)).toBeGreaterThanOrEqual(500);
      expect(isCleanProblem(attempt.problem), JSON.stringify(attempt.problem)).toBe(true);
    }

    await retryFailed(faults.appUrl, workspace.keys, records, Date.now() + 30_000);
    expect(records.every((batch) => batch.acknowledged)).toBe(true);
    const check = await checkStored(faults.databaseUrl, records);
    expect(check.samples).toEqual([]);
    expect(check).toMatchObject({ rowsLost: 0, duplicates: 0, revisions: 0, strayRows: 0, rowsStored: check.rowsAcknowledged });
    // The same app process answered throughout: it reconnected by itself.
    expect(faults.app().child.pid).toBe(appPid);
    expect(faults.app().child.exitCode).toBeNull();
  }, 90_000);
});
