import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createBenchWorkspace, type BenchWorkspace } from "../../bench/lib/stack";
import { startFaultStack, type FaultStack } from "./lib/fault-stack";
import { runLoad } from "./lib/load";

// The short form of `npm run bench:load`, on a PostgreSQL and app of its own so it slows no other test file.
let faults: FaultStack;
let workspace: BenchWorkspace;
const sharedDatabaseUrl = process.env.DATABASE_URL;
const PIPELINES = 5;

beforeAll(async () => {
  faults = await startFaultStack({ distDir: process.env.NEXT_DIST_DIR ?? ".next", reuseBuild: true });
  workspace = await createBenchWorkspace(faults.appUrl, faults.databaseUrl, PIPELINES);
}, 120_000);
afterAll(async () => {
  await faults?.stop();
  process.env.DATABASE_URL = sharedDatabaseUrl;
});

describe("a short bounded load", () => {
  it("takes 5 pipelines of 100-row batches and 10 status pollers for 5 s with no error and no lost row", async () => {
    const result = await runLoad({ appUrl: faults.appUrl, databaseUrl: faults.databaseUrl, workspace, pipelines: PIPELINES, batchRows: 100, pollers: 10, seconds: 5 });
    expect(result.batches.acknowledged).toBeGreaterThanOrEqual(PIPELINES * 2);
    expect(result.polls.sent).toBeGreaterThan(50);
    expect(result.batches.errorsByStatus).toEqual({});
    expect(result.polls.errorsByStatus).toEqual({});
    expect(result.rows).toEqual({ acknowledged: result.batches.acknowledged * 100, inDatabase: result.batches.acknowledged * 100, lost: 0, wrongValues: 0 });
  }, 60_000);
});
