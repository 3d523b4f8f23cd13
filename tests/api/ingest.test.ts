import { randomUUID } from "node:crypto";
import { eq, inArray } from "drizzle-orm";
import { inject } from "vitest";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import { arms, campaigns, dailyCountRevisions, dailyCounts, ingestBatches } from "@/db/schema";
import { createApiKey, createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { countRow, createCampaign, dayFromToday, dumpProductTables, meanCampaignBody, pushCounts } from "../factories-campaigns";

let northwind: TestWorkspace;
let other: TestWorkspace;
let key: string;
let conversion: CampaignDto;
let mean: CampaignDto;
let archived: CampaignDto;
let foreign: CampaignDto;

const day = (offset: number) => dayFromToday(offset);

async function countsOf(campaignId: string) {
  return getDb()
    .select({ armId: dailyCounts.armId, day: dailyCounts.day, units: dailyCounts.units, sum: dailyCounts.sum, sumSquares: dailyCounts.sumSquares, revision: dailyCounts.revision })
    .from(dailyCounts)
    .where(eq(dailyCounts.campaignId, campaignId))
    .orderBy(dailyCounts.day, dailyCounts.armId);
}

beforeAll(async () => {
  [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
  key = (await createApiKey(northwind, ["ingest"])).key;
  conversion = await createCampaign(northwind, { startDate: day(-10) });
  const meanResponse = await northwind.marketer.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: meanCampaignBody({ startDate: day(-10) }) });
  mean = meanResponse.body;
  archived = await createCampaign(northwind, { startDate: day(-10) });
  for (const status of ["running", "ended", "archived"]) {
    await northwind.marketer.client.json(`/api/v1/campaigns/${archived.id}`, { method: "PATCH", json: { status } });
  }
  foreign = await createCampaign(other, { startDate: day(-10) });
  // Stored counts the cumulative check reads: day −9 of the holdout converts every unit.
  const seeded = await pushCounts(key, [countRow(conversion.id, "holdout", day(-9), 10, 10), countRow(conversion.id, "treatment", day(-9), 90, 9)]);
  expect(seeded.status).toBe(200);
});

describe("POST /api/v1/ingest: accepted batches", () => {
  it("stores new rows (200 with the batch id), records the batch and marks the campaign for recompute", async () => {
    const campaign = await createCampaign(northwind, { startDate: day(-5) });
    const before = (await getDb().select({ countsChangedAt: campaigns.countsChangedAt }).from(campaigns).where(eq(campaigns.id, campaign.id)))[0];
    expect(before.countsChangedAt).toBeNull();
    const rows = [countRow(campaign.slug, "holdout", day(-5), 1000, 50), countRow(campaign.id, "treatment", day(-5), 9000, 500)];
    const response = await pushCounts(key, rows);
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ accepted: 2, replaced: 0, unchanged: 0 });
    expect(response.response.headers.get("ratelimit-policy")).toMatch(/q=\d+;w=60/);
    expect(response.response.headers.get("ratelimit")).toMatch(/r=\d+;t=\d+/);
    const [batch] = await getDb().select().from(ingestBatches).where(eq(ingestBatches.id, response.body.batchId as string));
    expect(batch).toMatchObject({ workspaceId: northwind.id, source: "api", rowCount: 2, outcome: "accepted", accepted: 2 });
    expect(batch.apiKeyId).not.toBeNull();
    const after = (await getDb().select({ countsChangedAt: campaigns.countsChangedAt }).from(campaigns).where(eq(campaigns.id, campaign.id)))[0];
    expect(after.countsChangedAt).not.toBeNull();
    expect((await countsOf(campaign.id)).map((row) => [row.day, row.units, row.sum])).toEqual(
      expect.arrayContaining([[day(-5), 1000, 50], [day(-5), 9000, 500]]),
    );
  });

  it("replaces a resent (arm, day) and keeps the old values as a revision; an identical resend changes nothing", async () => {
    const campaign = await createCampaign(northwind, { startDate: day(-5) });
    await pushCounts(key, [countRow(campaign.id, "holdout", day(-4), 1000, 50)]);
    const replaced = await pushCounts(key, [countRow(campaign.id, "holdout", day(-4), 1010, 52), countRow(campaign.id, "treatment", day(-4), 9000, 480)]);
    expect(replaced.body).toMatchObject({ accepted: 1, replaced: 1, unchanged: 0 });
    const revisions = await getDb().select().from(dailyCountRevisions).where(eq(dailyCountRevisions.campaignId, campaign.id));
    expect(revisions).toHaveLength(1);
    expect(revisions[0]).toMatchObject({ units: 1000, sum: 50, sumSquares: 50, revision: 0, replacedByBatchId: replaced.body.batchId });
    const stored = await countsOf(campaign.id);
    expect(stored.find((row) => row.units === 1010)?.revision).toBe(1);

    const before = await countsOf(campaign.id);
    const identical = await pushCounts(key, [countRow(campaign.id, "holdout", day(-4), 1010, 52)]);
    expect(identical.status).toBe(200);
    expect(identical.body).toMatchObject({ accepted: 0, replaced: 0, unchanged: 1 });
    expect(await countsOf(campaign.id)).toEqual(before);
    expect(await getDb().select().from(dailyCountRevisions).where(eq(dailyCountRevisions.campaignId, campaign.id))).toHaveLength(1);
  });

  it("tallies a batch of new, replaced and unchanged rows over two campaigns in the answer, the batch record and the revisions", async () => {
    const [first, second] = await Promise.all([createCampaign(northwind, { startDate: day(-5) }), createCampaign(northwind, { startDate: day(-5) })]);
    const seeded = await pushCounts(key, [countRow(first.id, "holdout", day(-3), 100, 5), countRow(first.id, "treatment", day(-3), 900, 40), countRow(second.id, "holdout", day(-3), 200, 7)]);
    expect(seeded.body).toMatchObject({ accepted: 3, replaced: 0, unchanged: 0 });
    const mixed = await pushCounts(key, [
      countRow(first.id, "holdout", day(-3), 100, 5),
      countRow(first.id, "treatment", day(-3), 901, 40),
      countRow(second.id, "holdout", day(-3), 200, 8),
      countRow(second.id, "treatment", day(-2), 800, 30),
      countRow(second.id, "holdout", day(-2), 150, 6),
    ]);
    expect(mixed.status).toBe(200);
    expect(mixed.body).toEqual({ batchId: expect.any(String), accepted: 2, replaced: 2, unchanged: 1 });
    const [batch] = await getDb().select().from(ingestBatches).where(eq(ingestBatches.id, mixed.body.batchId as string));
    expect(batch).toMatchObject({ rowCount: 5, accepted: 2, replaced: 2, unchanged: 1, responseStatus: 200, responseBody: mixed.body });
    const revisions = await getDb().select().from(dailyCountRevisions).where(eq(dailyCountRevisions.replacedByBatchId, mixed.body.batchId as string));
    expect(revisions.map((revision) => [revision.campaignId, revision.units, revision.sum, revision.revision, revision.batchId]).sort()).toEqual(
      [[first.id, 900, 40, 0, seeded.body.batchId], [second.id, 200, 7, 0, seeded.body.batchId]].sort(),
    );
    const counts = [...(await countsOf(first.id)), ...(await countsOf(second.id))];
    expect(counts.map((count) => [count.units, count.sum, count.revision]).sort()).toEqual([[100, 5, 0], [901, 40, 1], [200, 8, 1], [800, 30, 0], [150, 6, 0]].sort());
  });

  it("stores each row under its own campaign, arm and day when a batch mixes them out of order, and so do the revisions", async () => {
    const [first, second] = await Promise.all([createCampaign(northwind, { startDate: day(-8) }), createCampaign(northwind, { startDate: day(-8) })]);
    const armIds = new Map((await getDb().select({ id: arms.id, campaignId: arms.campaignId, key: arms.key }).from(arms)).map((arm) => [`${arm.campaignId}|${arm.key}`, arm.id]));
    const sent = [first, second].flatMap((campaign, c) =>
      ["treatment", "holdout"].flatMap((arm, a) => [-1, -7, -3, -8].map((offset) => ({ campaign, arm, offset, units: 1000 * (c + 1) + 100 * a - offset }))),
    );
    const rowsOf = (bump: number) => sent.map((row) => countRow(row.campaign.id, row.arm, day(row.offset), row.units + bump, 1));
    expect((await pushCounts(key, rowsOf(0))).body).toMatchObject({ accepted: 16, replaced: 0 });
    const expected = (bump: number) => sent.map((row) => [row.campaign.id, armIds.get(`${row.campaign.id}|${row.arm}`), day(row.offset), row.units + bump]).sort();
    const stored = async () => (await getDb().select().from(dailyCounts).where(inArray(dailyCounts.campaignId, [first.id, second.id]))).map((row) => [row.campaignId, row.armId, row.day, row.units]).sort();
    expect(await stored()).toEqual(expected(0));
    const resent = await pushCounts(key, rowsOf(5));
    expect(resent.body).toMatchObject({ accepted: 0, replaced: 16 });
    expect(await stored()).toEqual(expected(5));
    const revisions = await getDb().select().from(dailyCountRevisions).where(eq(dailyCountRevisions.replacedByBatchId, resent.body.batchId as string));
    expect(revisions.map((row) => [row.campaignId, row.armId, row.day, row.units]).sort()).toEqual(expected(0));
  });

  it("stores a mean metric's units, sum and sum of squares", async () => {
    const response = await pushCounts(key, [
      { campaign: mean.id, arm: "holdout", date: day(-3), units: 200, sum: 840.5, sumSquares: 65_000.25 },
      { campaign: mean.id, arm: "treatment", date: day(-3), units: 1800, sum: 7900, sumSquares: 590_000 },
    ]);
    expect(response.status).toBe(200);
    expect((await countsOf(mean.id)).map((row) => row.sum).sort()).toEqual([7900, 840.5].sort());
  });

  it("answers a replay with the first answer without writing again, and the same key with another body with 409", async () => {
    const idempotencyKey = `nightly-${randomUUID()}`;
    const rows = [countRow(conversion.id, "holdout", day(-8), 500, 20)];
    const first = await pushCounts(key, rows, { idempotencyKey });
    expect(first.status).toBe(200);
    const dump = await dumpProductTables([northwind.id, other.id]);
    const replay = await pushCounts(key, rows, { idempotencyKey });
    expect(replay.status).toBe(200);
    expect(replay.body).toEqual(first.body);
    expect(replay.response.headers.get("idempotent-replayed")).toBe("true");
    expect(await dumpProductTables([northwind.id, other.id])).toBe(dump);
    const conflict = await pushCounts(key, [countRow(conversion.id, "holdout", day(-8), 501, 20)], { idempotencyKey });
    expect(conflict.status).toBe(409);
    expect(conflict.response.headers.get("content-type")).toContain("application/problem+json");
    expect(await dumpProductTables([northwind.id, other.id])).toBe(dump);
  });

  it("serializes two concurrent batches on the same (arm, day): one final value, one revision, nothing lost", async () => {
    const campaign = await createCampaign(northwind, { startDate: day(-5) });
    const a = countRow(campaign.id, "treatment", day(-2), 7000, 300);
    const b = countRow(campaign.id, "treatment", day(-2), 7100, 310);
    const [first, second] = await Promise.all([pushCounts(key, [a]), pushCounts(key, [b])]);
    expect([first.status, second.status]).toEqual([200, 200]);
    const stored = await countsOf(campaign.id);
    expect(stored).toHaveLength(1);
    const revisions = await getDb().select().from(dailyCountRevisions).where(eq(dailyCountRevisions.campaignId, campaign.id));
    expect(revisions).toHaveLength(1);
    expect([stored[0].units, revisions[0].units].sort()).toEqual([7000, 7100]);
    expect(stored[0].revision).toBe(1);
  });

  it("answers concurrent replays of one key once: one batch, the same answer", async () => {
    const idempotencyKey = `replay-${randomUUID()}`;
    const rows = [countRow(conversion.id, "treatment", day(-7), 4000, 200)];
    const answers = await Promise.all([1, 2, 3].map(() => pushCounts(key, rows, { idempotencyKey })));
    expect(answers.map((answer) => answer.status)).toEqual([200, 200, 200]);
    expect(new Set(answers.map((answer) => answer.body.batchId)).size).toBe(1);
    const batches = await getDb().select().from(ingestBatches).where(eq(ingestBatches.idempotencyKey, idempotencyKey));
    expect(batches).toHaveLength(1);
  });
});

describe("POST /api/v1/ingest: keys", () => {
  it("refuses a missing key (401), an unknown key (401), a revoked key (401) and a key without the ingest permission (403), writing nothing", async () => {
    const revoked = await createApiKey(northwind, ["ingest"]);
    const removed = await northwind.admin.client.json(`/api/v1/keys/${revoked.id}`, { method: "DELETE" });
    expect([200, 204]).toContain(removed.status);
    const readOnly = await createApiKey(northwind, ["read"]);
    const dump = await dumpProductTables([northwind.id, other.id]);
    const rows = [countRow(conversion.id, "holdout", day(-6), 100, 5)];
    const url = new URL("/api/v1/ingest", inject("appUrl"));
    const noKey = await fetch(url, { method: "POST", headers: { "content-type": "application/json", "idempotency-key": randomUUID() }, body: JSON.stringify({ rows }) });
    expect(noKey.status).toBe(401);
    expect((await pushCounts("psk_not-a-real-key", rows)).status).toBe(401);
    expect((await pushCounts(revoked.key, rows)).status).toBe(401);
    expect((await pushCounts(readOnly.key, rows)).status).toBe(403);
    const session = await northwind.admin.client.json("/api/v1/ingest", { method: "POST", json: { rows }, headers: { "idempotency-key": randomUUID() } });
    expect(session.status).toBe(401);
    expect(await dumpProductTables([northwind.id, other.id])).toBe(dump);
  });
});

type Case = { name: string; status: number; rows?: () => unknown[]; body?: () => unknown; raw?: () => string; headers?: Record<string, string>; row?: number; pointer?: string };

const good = () => countRow(conversion.id, "holdout", day(-6), 100, 5);

/** Every kind of bad input tried, what it must answer, and which row it must name. */
const BAD_INPUTS: Case[] = [
  { name: "negative units", status: 422, rows: () => [{ ...good(), units: -1 }], row: 0, pointer: "/rows/0/units" },
  { name: "fractional units", status: 422, rows: () => [{ ...good(), units: 10.5 }], row: 0, pointer: "/rows/0/units" },
  { name: "units as a string", status: 422, rows: () => [{ ...good(), units: "100" }], row: 0, pointer: "/rows/0/units" },
  { name: "units missing", status: 422, rows: () => [{ campaign: conversion.id, arm: "holdout", date: day(-6), conversions: 5 }], row: 0, pointer: "/rows/0/units" },
  { name: "units null", status: 422, rows: () => [{ ...good(), units: null }], row: 0, pointer: "/rows/0/units" },
  { name: "units above 2³¹", status: 422, rows: () => [{ ...good(), units: 3_000_000_000 }], row: 0, pointer: "/rows/0/units" },
  { name: "negative conversions", status: 422, rows: () => [{ ...good(), conversions: -2 }], row: 0, pointer: "/rows/0/conversions" },
  { name: "fractional conversions", status: 422, rows: () => [{ ...good(), conversions: 2.5 }], row: 0, pointer: "/rows/0/conversions" },
  { name: "conversions above units on the first day", status: 422, rows: () => [countRow(conversion.id, "treatment", day(-10), 10, 11)], row: 0, pointer: "/rows/0/conversions" },
  {
    name: "a resend that lowers earlier units below the stored cumulative conversions",
    status: 422,
    rows: () => [countRow(conversion.id, "holdout", day(-10), 0, 0), countRow(conversion.id, "holdout", day(-9), 9, 9), countRow(conversion.id, "holdout", day(-8), 0, 1)],
    row: 2,
  },
  { name: "30 February", status: 422, rows: () => [{ ...good(), date: "2026-02-30" }], row: 0, pointer: "/rows/0/date" },
  { name: "a US-style date", status: 422, rows: () => [{ ...good(), date: "03/01/2026" }], row: 0, pointer: "/rows/0/date" },
  { name: "a timestamp instead of a day", status: 422, rows: () => [{ ...good(), date: `${day(-6)}T00:00:00Z` }], row: 0, pointer: "/rows/0/date" },
  { name: "a day in the future", status: 422, rows: () => [{ ...good(), date: day(2) }], row: 0, pointer: "/rows/0/date" },
  { name: "a day before the start", status: 422, rows: () => [{ ...good(), date: day(-11) }], row: 0, pointer: "/rows/0/date" },
  { name: "an unknown campaign slug", status: 422, rows: () => [{ ...good(), campaign: "winter-jackets" }], row: 0, pointer: "/rows/0/campaign" },
  { name: "an unknown campaign id", status: 422, rows: () => [{ ...good(), campaign: randomUUID() }], row: 0, pointer: "/rows/0/campaign" },
  { name: "another workspace's campaign id", status: 422, rows: () => [{ ...good(), campaign: foreign.id }], row: 0, pointer: "/rows/0/campaign" },
  { name: "another workspace's campaign slug", status: 422, rows: () => [{ ...good(), campaign: foreign.slug }], row: 0, pointer: "/rows/0/campaign" },
  { name: "an archived campaign", status: 422, rows: () => [{ ...good(), campaign: archived.id }], row: 0, pointer: "/rows/0/campaign" },
  { name: "an empty campaign", status: 422, rows: () => [{ ...good(), campaign: "" }], row: 0, pointer: "/rows/0/campaign" },
  { name: "an unknown arm", status: 422, rows: () => [{ ...good(), arm: "variant-z" }], row: 0, pointer: "/rows/0/arm" },
  { name: "an arm key with spaces", status: 422, rows: () => [{ ...good(), arm: "Hold Out" }], row: 0, pointer: "/rows/0/arm" },
  { name: "the same arm and day twice in one batch", status: 422, rows: () => [good(), { ...good(), units: 101 }], row: 1, pointer: "/rows/1/date" },
  { name: "a good row beside a bad one (all or nothing)", status: 422, rows: () => [countRow(conversion.id, "treatment", day(-6), 900, 40), { ...good(), arm: "nobody" }], row: 1 },
  { name: "sum and sumSquares for a conversion campaign", status: 422, rows: () => [{ campaign: conversion.id, arm: "holdout", date: day(-6), units: 100, sum: 5, sumSquares: 5 }], row: 0, pointer: "/rows/0/conversions" },
  { name: "both conversions and sum", status: 422, rows: () => [{ ...good(), sum: 5, sumSquares: 5 }], row: 0 },
  { name: "no outcome at all", status: 422, rows: () => [{ campaign: conversion.id, arm: "holdout", date: day(-6), units: 100 }], row: 0 },
  { name: "conversions for a mean campaign", status: 422, rows: () => [countRow(mean.id, "holdout", day(-6), 100, 5)], row: 0, pointer: "/rows/0/conversions" },
  { name: "a sum of squares below sum²/units", status: 422, rows: () => [{ campaign: mean.id, arm: "holdout", date: day(-6), units: 10, sum: 100, sumSquares: 10 }], row: 0, pointer: "/rows/0/sumSquares" },
  { name: "a negative sum of squares", status: 422, rows: () => [{ campaign: mean.id, arm: "holdout", date: day(-6), units: 10, sum: 0, sumSquares: -1 }], row: 0, pointer: "/rows/0/sumSquares" },
  { name: "sum without sumSquares", status: 422, rows: () => [{ campaign: mean.id, arm: "holdout", date: day(-6), units: 10, sum: 40 }], row: 0, pointer: "/rows/0/sumSquares" },
  { name: "a sum with zero units", status: 422, rows: () => [{ campaign: mean.id, arm: "holdout", date: day(-6), units: 0, sum: 4, sumSquares: 16 }], row: 0, pointer: "/rows/0/sum" },
  { name: "an unknown field in a row", status: 422, rows: () => [{ ...good(), revenue: 10 }], row: 0 },
  { name: "a row that is not an object", status: 422, rows: () => ["2026-03-01,holdout,100,5"], row: 0 },
  { name: "the bad third row of three", status: 422, rows: () => [countRow(conversion.id, "treatment", day(-5), 900, 40), countRow(conversion.id, "holdout", day(-5), 100, 4), { ...good(), units: -5 }], row: 2, pointer: "/rows/2/units" },
  { name: "no rows", status: 422, body: () => ({ rows: [] }), pointer: "/rows" },
  { name: "rows that are not a list", status: 422, body: () => ({ rows: { 0: good() } }), pointer: "/rows" },
  { name: "a list instead of an object", status: 422, body: () => [good()] },
  { name: "an unknown top-level field", status: 422, body: () => ({ rows: [good()], dryRun: true }) },
  { name: "5,001 rows", status: 422, body: () => ({ rows: Array.from({ length: 5001 }, (_, i) => countRow(conversion.id, "holdout", day(-6), i, 0)) }), pointer: "/rows" },
  { name: "a body over 1 MiB", status: 413, raw: () => JSON.stringify({ rows: [good()], padding: "x".repeat(1_100_000) }) },
  { name: "malformed JSON", status: 400, raw: () => '{"rows": [' },
  { name: "an empty body", status: 400, raw: () => "" },
  { name: "no Idempotency-Key", status: 422, rows: () => [good()], headers: { "idempotency-key": "" }, pointer: "/headers/idempotency-key" },
  { name: "an Idempotency-Key of 300 characters", status: 422, rows: () => [good()], headers: { "idempotency-key": "k".repeat(300) }, pointer: "/headers/idempotency-key" },
  { name: "a text/plain body", status: 422, rows: () => [good()], headers: { "content-type": "text/plain" }, pointer: "/headers/content-type" },
];

describe("POST /api/v1/ingest: bad input", () => {
  it("lists at least 30 kinds of bad input", () => {
    expect(BAD_INPUTS.length).toBeGreaterThanOrEqual(30);
  });

  it.each(BAD_INPUTS)("answers $status for $name, names the row, and leaves the product tables byte-for-byte unchanged", async (bad) => {
    const dump = await dumpProductTables([northwind.id, other.id]);
    const headers: Record<string, string> = { authorization: `Bearer ${key}`, "content-type": "application/json", "idempotency-key": randomUUID(), ...bad.headers };
    if (headers["idempotency-key"] === "") delete headers["idempotency-key"];
    const body = bad.raw ? bad.raw() : JSON.stringify(bad.body ? bad.body() : { rows: bad.rows!() });
    const response = await fetch(new URL("/api/v1/ingest", inject("appUrl")), { method: "POST", headers, body });
    const problem = (await response.json()) as { status: number; title: string; detail: string; errors?: { row?: number; pointer: string; message: string }[] };
    expect(response.status).toBe(bad.status);
    expect(response.headers.get("content-type")).toContain("application/problem+json");
    expect(problem.status).toBe(bad.status);
    expect(problem.detail).toBeTruthy();
    if (bad.row !== undefined) expect(problem.errors?.some((error) => error.row === bad.row)).toBe(true);
    if (bad.pointer !== undefined) expect(problem.errors?.some((error) => error.pointer.startsWith(bad.pointer!))).toBe(true);
    expect(await dumpProductTables([northwind.id, other.id])).toBe(dump);
  });
});
