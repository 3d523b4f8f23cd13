import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { runRecompute } from "@/cron/recompute";
import { getDb } from "@/db";
import { listAnalysisDays } from "@/db/queries/analysis";
import { apikeys, campaigns } from "@/db/schema";
import type { CampaignSeries, CampaignStatus } from "@/lib/campaigns/campaign-status";
import { createApiKey, createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { countRow, createCampaign, dayFromToday, pushCounts } from "../factories-campaigns";

let northwind: TestWorkspace;
let key: string;

beforeAll(async () => {
  northwind = await createWorkspaceWithRoles("Northwind Outfitters");
  key = (await createApiKey(northwind, ["ingest"])).key;
});

/** The JSON form of a stored interval end: ±Infinity (an open end) is null. */
function end(value: number | null): number | null {
  return value !== null && Number.isFinite(value) ? value : null;
}

async function startedCampaign(overrides: Record<string, unknown> = {}) {
  const campaign = await createCampaign(northwind, { startDate: dayFromToday(-6), ...overrides });
  const moved = await northwind.marketer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { status: "running" } });
  expect(moved.status).toBe(200);
  return campaign;
}

function dayRows(slug: string, offset: number, treatmentConversions: number) {
  return [countRow(slug, "holdout", dayFromToday(offset), 2_000, 100), countRow(slug, "treatment", dayFromToday(offset), 18_000, treatmentConversions)];
}

const status = async (id: string) => (await northwind.viewer.client.json<CampaignStatus>(`/api/v1/campaigns/${id}/status`)).body;
const series = async (id: string) => (await northwind.viewer.client.json<CampaignSeries>(`/api/v1/campaigns/${id}/series`)).body;

/** What the status endpoint must answer for the worker's stored rows (read straight from analysis_days and campaigns). */
async function expectStatusIsStoredAnalysis(campaignId: string) {
  const stored = await listAnalysisDays(campaignId);
  const [row] = await getDb().select({ analyzedAt: campaigns.analyzedAt, currentCall: campaigns.currentCall }).from(campaigns).where(eq(campaigns.id, campaignId));
  const last = stored.at(-1)!;
  const answered = await status(campaignId);
  expect(answered).toMatchObject({
    call: last.call,
    asOf: last.day,
    daysRun: last.daysRun,
    lift: {
      absolute: last.liftAbsolute,
      relative: last.liftRelative,
      cs: [end(last.sequenceLow), end(last.sequenceHigh)],
      ci: last.intervalLow === null && last.intervalHigh === null ? null : [end(last.intervalLow), end(last.intervalHigh)],
    },
    sequential: { p: last.sequentialP },
    fixed: { p: last.fixedP },
    health: { srmP: last.srmSequentialP },
    analyzedAt: row.analyzedAt!.toISOString(),
    stale: false,
  });
  expect(answered.call).toBe(row.currentCall);
  const days = await series(campaignId);
  expect(days.days.map((day) => [day.date, day.daysRun, day.call, day.sequential.p, day.fixed.p])).toEqual(
    stored.map((day) => [day.day, day.daysRun, day.call, day.sequentialP, day.fixedP]),
  );
  expect(days).toMatchObject({ analyzedAt: answered.analyzedAt, stale: false });
  return answered;
}

describe("GET /api/v1/campaigns/:id/status reads the worker's analysis", () => {
  it("answers collecting with null numbers before the first analysis, then exactly the stored analysis", async () => {
    const campaign = await startedCampaign();
    expect(await status(campaign.id)).toMatchObject({
      call: "collecting",
      asOf: null,
      daysRun: 0,
      lift: { absolute: null, relative: null, cs: null, ci: null },
      sequential: { p: null },
      fixed: { p: null, horizonReached: false },
      health: { srmP: null, issues: [] },
      analyzedAt: null,
      stale: false,
    });
    expect(await series(campaign.id)).toMatchObject({ days: [], analyzedAt: null, stale: false });

    expect((await pushCounts(key, [-6, -5, -4].flatMap((offset) => dayRows(campaign.slug, offset, 1_170)))).status).toBe(200);
    expect(await status(campaign.id)).toMatchObject({ call: "collecting", asOf: null, analyzedAt: null, stale: true });

    const summary = await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    expect(summary.campaigns.find((c) => c.campaignId === campaign.id)).toMatchObject({ recomputed: true, days: 3 });
    const answered = await expectStatusIsStoredAnalysis(campaign.id);
    expect(answered.asOf).toBe(dayFromToday(-4));
    // 1170 / 18000 = 6.5 % against 100 / 2000 = 5 %: a relative lift of +30 %.
    expect(answered.lift.relative).toBeCloseTo(0.3, 12);
  });

  it("turns stale on a new ingest, keeps the old numbers until the next recompute, then shows the new day", async () => {
    const campaign = await startedCampaign({ sides: 1 });
    expect((await pushCounts(key, [-6, -5].flatMap((offset) => dayRows(campaign.slug, offset, 1_000)))).status).toBe(200);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    const before = await expectStatusIsStoredAnalysis(campaign.id);
    // One-sided: the fixed-horizon interval's upper end is open (stored +Infinity), answered as null;
    // the always-valid sequence is two-sided whatever the sides (lib/sequential/analyze-campaign.ts).
    expect(before.lift.ci![1]).toBeNull();
    expect(before.lift.cs![1]).not.toBeNull();

    expect((await pushCounts(key, dayRows(campaign.slug, -4, 1_260))).status).toBe(200);
    const stale = await status(campaign.id);
    expect(stale).toMatchObject({ stale: true, analyzedAt: before.analyzedAt, asOf: before.asOf, daysRun: before.daysRun, lift: before.lift, sequential: before.sequential });
    expect((await series(campaign.id)).stale).toBe(true);

    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    const after = await expectStatusIsStoredAnalysis(campaign.id);
    expect(after.asOf).toBe(dayFromToday(-4));
    expect(after.daysRun).toBe(3);
    expect(new Date(after.analyzedAt!).getTime()).toBeGreaterThan(new Date(before.analyzedAt!).getTime());
  });

  it("turns stale when the horizon or (by an admin) the plan changes after counts arrived", async () => {
    const campaign = await startedCampaign();
    expect((await pushCounts(key, dayRows(campaign.slug, -6, 1_000))).status).toBe(200);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    expect((await status(campaign.id)).stale).toBe(false);
    // The horizon is an input of the analysis (the horizon call), though not of the locked plan.
    const longer = await northwind.marketer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { maxDays: 35 } });
    expect(longer.status).toBe(200);
    expect((await status(campaign.id)).stale).toBe(true);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    expect((await status(campaign.id)).stale).toBe(false);
    const plan = {
      metric: { kind: "conversion", name: "First purchase" },
      baselineRate: 0.05,
      minimumLift: 0.1,
      alpha: 0.1,
      power: 0.8,
      sides: 2,
      arms: [
        { key: "holdout", name: "Holdout", share: 0.1 },
        { key: "treatment", name: "Spring e-mail", share: 0.9 },
      ],
    };
    const replanned = await northwind.admin.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { plan, reason: "Finance asked for α = 0.10." } });
    expect(replanned.status).toBe(200);
    expect((await status(campaign.id)).stale).toBe(true);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    expect((await status(campaign.id)).stale).toBe(false);
  });
});

const readWithKey = (apiKey: string, reference: string) =>
  fetch(new URL(`/api/v1/campaigns/${reference}/status`, inject("appUrl")), { headers: { authorization: `Bearer ${apiKey}` } });

describe("GET /api/v1/campaigns/:id/status under polling", () => {
  it("answers the issues and horizon of the series' last day, by id and by slug", async () => {
    const campaign = await startedCampaign();
    // Twice the planned holdout share on every day.
    const skewed = (offset: number) => [countRow(campaign.slug, "holdout", dayFromToday(offset), 4_000, 200), countRow(campaign.slug, "treatment", dayFromToday(offset), 16_000, 900)];
    expect((await pushCounts(key, [-6, -5, -4].flatMap(skewed))).status).toBe(200);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    const answered = await expectStatusIsStoredAnalysis(campaign.id);
    const lastDay = (await series(campaign.id)).days.at(-1)!;
    expect(answered.health.issues).toEqual(lastDay.health.issues);
    expect(answered.fixed).toEqual(lastDay.fixed);
    expect(await status(campaign.slug)).toEqual(answered);
  });

  it("answers 304 without a body while the status is unchanged, and a new ETag once it changes", async () => {
    const campaign = await startedCampaign();
    const first = await northwind.viewer.client.fetch(`/api/v1/campaigns/${campaign.id}/status`);
    expect(first.status).toBe(200);
    expect(first.headers.get("cache-control")).toBe("private, no-cache");
    const etag = first.headers.get("etag");
    expect(etag).toMatch(/^"[\w-]{20,}"$/);
    const again = await northwind.viewer.client.fetch(`/api/v1/campaigns/${campaign.id}/status`, { headers: { "if-none-match": etag! } });
    expect(again.status).toBe(304);
    expect(await again.text()).toBe("");
    expect(again.headers.get("etag")).toBe(etag);

    expect((await pushCounts(key, dayRows(campaign.slug, -6, 1_000))).status).toBe(200);
    const changed = await northwind.viewer.client.fetch(`/api/v1/campaigns/${campaign.id}/status`, { headers: { "if-none-match": etag! } });
    expect(changed.status).toBe(200);
    expect(changed.headers.get("etag")).not.toBe(etag);
    expect(((await changed.json()) as CampaignStatus).stale).toBe(true);
  });

  it("refuses a read key at once after its revocation, though it was just verified", async () => {
    const campaign = await startedCampaign();
    const readKey = await createApiKey(northwind, ["read"]);
    expect((await readWithKey(readKey.key, campaign.id)).status).toBe(200);
    expect((await northwind.admin.client.fetch(`/api/v1/keys/${readKey.id}`, { method: "DELETE" })).status).toBe(204);
    expect((await readWithKey(readKey.key, campaign.id)).status).toBe(401);
  });

  it("holds a read key to its rate limit (429 with Retry-After)", async () => {
    const campaign = await startedCampaign();
    const readKey = await createApiKey(northwind, ["read"]);
    await getDb().update(apikeys).set({ rateLimitMax: 2 }).where(eq(apikeys.id, readKey.id));
    const statuses: number[] = [];
    let limited: Response | undefined;
    for (let attempt = 0; attempt < 3; attempt++) {
      const response = await readWithKey(readKey.key, campaign.id);
      statuses.push(response.status);
      if (response.status === 429) limited = response;
    }
    expect(statuses).toEqual([200, 200, 429]);
    const retryAfter = Number(limited!.headers.get("retry-after"));
    expect(Number.isInteger(retryAfter) && retryAfter >= 1 && retryAfter <= 60, String(retryAfter)).toBe(true);
  });

  it("refuses another workspace's key and a key of this workspace without the read permission", async () => {
    const campaign = await startedCampaign();
    const other = await createWorkspaceWithRoles("Northwind Rivals");
    const otherKey = await createApiKey(other, ["read"]);
    expect((await readWithKey(otherKey.key, campaign.id)).status).toBe(404);
    expect((await readWithKey(key, campaign.id)).status).toBe(403);
    expect((await readWithKey(`${key}x`, campaign.id)).status).toBe(401);
  });
});
