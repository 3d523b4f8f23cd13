import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createBenchCampaign, createBenchWorkspace, type BenchWorkspace } from "../../bench/lib/stack";
import { startFaultStack, waitFor, type FaultStack } from "./lib/fault-stack";
import { batchSource, checkStored, launchCampaigns, sendBatch, type BatchRecord } from "./lib/pipelines";

// Its own PostgreSQL and app: this file SIGKILLs the app.
let faults: FaultStack;
let workspace: BenchWorkspace;
const sharedDatabaseUrl = process.env.DATABASE_URL;

beforeAll(async () => {
  faults = await startFaultStack({ distDir: process.env.NEXT_DIST_DIR ?? ".next", reuseBuild: true });
  workspace = await createBenchWorkspace(faults.appUrl, faults.databaseUrl, 1);
}, 120_000);
afterAll(async () => {
  await faults?.stop();
  process.env.DATABASE_URL = sharedDatabaseUrl;
});

function passesDone(lines: Record<string, unknown>[]): Record<string, unknown>[] {
  return lines.filter((line) => line.msg === "recompute pass done");
}

describe("the app killed and started again on the same port", () => {
  it("keeps the signed-in session, the API key and the data; the running worker's next pass succeeds", async () => {
    const campaign = await createBenchCampaign(workspace.admin, 0, 60);
    await launchCampaigns(faults.databaseUrl, [campaign.id]);
    const next = batchSource([{ id: campaign.id, days: 60 }], 30);
    const first: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows: next()!, attempts: [], acknowledged: false };
    expect((await sendBatch(faults.appUrl, workspace.keys[0], first, "before")).status).toBe(200);
    const worker = faults.spawnWorker([], { RECOMPUTE_CRON: "*/2 * * * * *", MAILER_CRON: "*/5 * * * * *" });
    await waitFor("the worker's first pass over the new counts", () => passesDone(worker.lines).some((line) => Number(line.recomputed) >= 1)).catch((error: Error) => {
      throw new Error(`${error.message}; worker said: ${JSON.stringify(worker.lines.slice(-5))} ${worker.stderr().slice(-500)}`);
    });

    const killedPid = faults.app().child.pid;
    await faults.killApp();
    await expect(fetch(`${faults.appUrl}/api/health`)).rejects.toThrow();
    await faults.startAppAgain();
    expect(faults.app().child.pid).not.toBe(killedPid);

    const session = await workspace.admin.json<{ user?: { email: string } } | null>("/api/auth/get-session");
    expect(session.status).toBe(200);
    expect(session.body?.user?.email).toMatch(/@northwind\.example$/);
    const listed = await workspace.admin.json<{ campaigns?: { id: string }[] } | { id: string }[]>("/api/v1/campaigns");
    expect(listed.status).toBe(200);
    expect(JSON.stringify(listed.body)).toContain(campaign.id);

    const passesBefore = passesDone(worker.lines).length;
    const second: BatchRecord = { pipeline: 0, idempotencyKey: crypto.randomUUID(), rows: next()!, attempts: [], acknowledged: false };
    expect((await sendBatch(faults.appUrl, workspace.keys[0], second, "after")).status).toBe(200);
    // A replay of the batch sent before the kill is answered from the record, not stored twice.
    expect((await sendBatch(faults.appUrl, workspace.keys[0], first, "replay")).status).toBe(200);
    const check = await checkStored(faults.databaseUrl, [first, second]);
    expect(check).toMatchObject({ rowsLost: 0, duplicates: 0, revisions: 0, strayRows: 0, rowsStored: 120 });

    await waitFor("a worker pass over the counts sent after the restart", () => passesDone(worker.lines).slice(passesBefore).some((line) => Number(line.recomputed) >= 1));
    expect(worker.child.exitCode).toBeNull();
    expect(worker.lines.filter((line) => line.level === 50 || line.level === 60)).toEqual([]);
  }, 90_000);
});
