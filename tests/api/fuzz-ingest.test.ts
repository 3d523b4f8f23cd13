import fc from "fast-check";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { dumpProductTables } from "../factories-campaigns";
import { checkCsvCase, checkIngestCase, createIngestFuzzWorld, ingestArbitraries, sendIngest, type IngestFuzzWorld } from "../helpers/ingest-arbitraries";

// Property-based bad input for the ingest API and the CSV upload (issue 7, "Bad input"): every generated
// bad batch or file gets a 4xx problem document naming the problem, and nothing is written.
// The long form of the same properties: `npm run soak:fuzz`.
const SEED = 20_260_701;
const INGEST_RUNS = 300;
const CSV_RUNS = 100;
const VALID_RUNS = 40;

let world: IngestFuzzWorld;
let arbitraries: ReturnType<typeof ingestArbitraries>;
const workspaces = () => [world.northwind.id, world.other.id];

beforeAll(async () => {
  world = await createIngestFuzzWorld(inject("appUrl"));
  arbitraries = ingestArbitraries(world);
}, 60_000);

describe("fuzzing POST /api/v1/ingest", () => {
  it(`answers ${INGEST_RUNS} generated bad batches with a 4xx problem naming the problem, and writes nothing`, async () => {
    const before = await dumpProductTables(workspaces());
    const kinds = new Map<string, number>();
    await fc.assert(
      fc.asyncProperty(arbitraries.ingestCase, async (testCase) => {
        kinds.set(testCase.kind, (kinds.get(testCase.kind) ?? 0) + 1);
        await checkIngestCase(world, testCase);
      }),
      { seed: SEED, numRuns: INGEST_RUNS, endOnFailure: true },
    );
    expect(await dumpProductTables(workspaces())).toBe(before);
    expect(kinds.get("row")).toBeGreaterThan(100);
  }, 90_000);

  it(`accepts ${VALID_RUNS} generated valid batches (200, every row counted)`, async () => {
    const batch = fc.uniqueArray(arbitraries.validRow, { minLength: 1, maxLength: 12, selector: (row) => `${row.arm}|${row.date}` });
    await fc.assert(
      fc.asyncProperty(batch, async (rows) => {
        const response = await sendIngest(world, { kind: "valid", body: JSON.stringify({ rows: rows.map((row) => ({ campaign: world.accepting.id, ...row })) }) });
        const body = await response.json();
        expect(response.status, JSON.stringify(body)).toBe(200);
        expect(body.accepted + body.replaced + body.unchanged).toBe(rows.length);
      }),
      { seed: SEED, numRuns: VALID_RUNS, endOnFailure: true },
    );
  }, 60_000);
});

describe("fuzzing the CSV upload (POST /api/v1/campaigns/:id/counts)", () => {
  it(`answers ${CSV_RUNS} generated bad files with a 4xx problem naming the line, and writes nothing`, async () => {
    const before = await dumpProductTables(workspaces());
    await fc.assert(
      fc.asyncProperty(arbitraries.csvCase, async (testCase) => {
        await checkCsvCase(world, testCase);
      }),
      { seed: SEED, numRuns: CSV_RUNS, endOnFailure: true },
    );
    expect(await dumpProductTables(workspaces())).toBe(before);
  }, 60_000);
});
