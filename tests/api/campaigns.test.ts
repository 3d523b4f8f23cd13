import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import { runRecompute } from "@/cron/recompute";
import { auditEvents } from "@/db/schema";
import { computePlan } from "@/lib/campaigns/compute-plan";
import { sampleSizeTwoProportions } from "@/lib/sequential";
import { TestClient } from "../helpers/http-client";
import { createApiKey, createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { campaignBody, countRow, createCampaign, dayFromToday, meanCampaignBody, pushCounts } from "../factories-campaigns";

let northwind: TestWorkspace;
let other: TestWorkspace;

beforeAll(async () => {
  [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
});

describe("POST /api/v1/campaigns", () => {
  it("stores a campaign with its id, slug, τ and fixed-horizon plan (201)", async () => {
    const body = campaignBody({ name: "Trail shoe spring e-mail" });
    const created = await northwind.marketer.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: body });
    expect(created.status).toBe(201);
    expect(created.body.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(created.body.slug).toBe("trail-shoe-spring-e-mail");
    expect(created.body.status).toBe("draft");
    expect(created.body.arms.map((arm) => [arm.key, arm.share])).toEqual([["holdout", 0.1], ["treatment", 0.9]]);
    // The plan is lib/sequential's: one treatment at α = 0.05 against a 10 % holdout.
    const size = sampleSizeTwoProportions({ baselineRate: 0.05, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2, holdoutShare: 0.1 });
    expect(created.body.plan.perArm).toEqual({ holdout: size.holdout, treatment: size.treatment });
    expect(created.body.plan.days).toBe(Math.ceil(created.body.plan.total / 20_000));
    expect(created.body.tau).toBeGreaterThan(0);
    const again = await northwind.marketer.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: body });
    expect(again.body.slug).toBe("trail-shoe-spring-e-mail-2");
    const audit = await getDb().select().from(auditEvents).where(and(eq(auditEvents.targetId, created.body.id), eq(auditEvents.action, "campaign.create")));
    expect(audit).toHaveLength(1);
  });

  it("sizes a mean metric and a two-treatment plan at α/2 (Bonferroni)", async () => {
    const mean = await northwind.admin.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: meanCampaignBody() });
    expect(mean.status).toBe(201);
    expect(mean.body.metric).toEqual({ kind: "mean", name: "Order value per recipient", unit: "USD" });
    expect(mean.body.baselineSd).toBe(18);
    const arms = [
      { key: "holdout", name: "Holdout", share: 0.2 },
      { key: "treatment", name: "Free shipping", share: 0.4 },
      { key: "variant-b", name: "10 % off", share: 0.4 },
    ];
    const two = await northwind.marketer.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: campaignBody({ arms }) });
    expect(two.status).toBe(201);
    const size = sampleSizeTwoProportions({ baselineRate: 0.05, minimumLift: 0.1, significanceLevel: 0.025, power: 0.8, sides: 2, holdoutShare: 1 / 3 });
    expect(two.body.plan.perArm.treatment).toBe(size.treatment);
    expect(two.body.plan.perArm["variant-b"]).toBe(size.treatment);
  });

  it.each([
    ["no name", { name: "" }, "/name"],
    ["a share sum of 90 %", { arms: [{ key: "holdout", name: "Holdout", share: 0.1 }, { key: "treatment", name: "T", share: 0.8 }] }, "/arms"],
    ["no holdout", { arms: [{ key: "control", name: "Control", share: 0.5 }, { key: "treatment", name: "T", share: 0.5 }] }, "/arms"],
    ["a duplicate arm key", { arms: [{ key: "holdout", name: "H", share: 0.5 }, { key: "holdout", name: "H2", share: 0.5 }] }, "/arms"],
    ["α of 0.5", { alpha: 0.5 }, "/alpha"],
    ["power of 1", { power: 1 }, "/power"],
    ["sides 3", { sides: 3 }, "/sides"],
    ["a baseline of 1.2", { baselineRate: 1.2 }, "/baselineRate"],
    ["a lift past 100 % conversion", { baselineRate: 0.6, minimumLift: 1 }, "/minimumLift"],
    ["no baseline", { baselineRate: undefined }, "/baselineRate"],
    ["30 February", { startDate: "2026-02-30" }, "/startDate"],
    ["maxDays 0", { maxDays: 0 }, "/maxDays"],
    ["an unknown field", { budget: 1000 }, ""],
    ["a text α", { alpha: "0.05" }, "/alpha"],
  ])("answers 422 for %s", async (_label, overrides, pointer) => {
    const response = await northwind.marketer.client.json<{ status: number; errors: { pointer: string }[] }>("/api/v1/campaigns", { method: "POST", json: campaignBody(overrides) });
    expect(response.status).toBe(422);
    expect(response.response.headers.get("content-type")).toContain("application/problem+json");
    expect(response.body.errors.some((error) => error.pointer.startsWith(pointer))).toBe(true);
  });

  it("refuses the unauthenticated (401), a viewer or lead (403), a cross-origin POST (403) and a pipeline key (403)", async () => {
    const anonymous = await new TestClient().json("/api/v1/campaigns", { method: "POST", json: campaignBody() });
    expect(anonymous.status).toBe(401);
    for (const user of [northwind.viewer, northwind.lead]) {
      const refused = await user.client.json("/api/v1/campaigns", { method: "POST", json: campaignBody() });
      expect(refused.status).toBe(403);
    }
    const forged = await northwind.marketer.client.json("/api/v1/campaigns", { method: "POST", json: campaignBody(), headers: { origin: "http://evil.example" } });
    expect(forged.status).toBe(403);
    const key = await createApiKey(northwind, ["ingest", "read"]);
    const byKey = await fetch(new URL("/api/v1/campaigns", northwind.admin.client.baseUrl), {
      method: "POST",
      headers: { authorization: `Bearer ${key.key}`, "content-type": "application/json" },
      body: JSON.stringify(campaignBody()),
    });
    expect(byKey.status).toBe(403);
  });
});

describe("GET /api/v1/campaigns and /:id", () => {
  it("lists the workspace's campaigns only, filters by status, and hides another workspace's campaign (404)", async () => {
    const mine = await createCampaign(northwind);
    const theirs = await createCampaign(other);
    const list = await northwind.viewer.client.json<{ campaigns: CampaignDto[] }>("/api/v1/campaigns");
    expect(list.status).toBe(200);
    expect(list.body.campaigns.some((campaign) => campaign.id === mine.id)).toBe(true);
    expect(list.body.campaigns.some((campaign) => campaign.id === theirs.id)).toBe(false);
    const drafts = await northwind.viewer.client.json<{ campaigns: CampaignDto[] }>("/api/v1/campaigns?status=draft");
    expect(drafts.body.campaigns.every((campaign) => campaign.status === "draft")).toBe(true);
    const badFilter = await northwind.viewer.client.json("/api/v1/campaigns?status=finished");
    expect(badFilter.status).toBe(422);
    const one = await northwind.viewer.client.json<CampaignDto>(`/api/v1/campaigns/${mine.slug}`);
    expect(one.body.id).toBe(mine.id);
    const foreign = await northwind.admin.client.json(`/api/v1/campaigns/${theirs.id}`);
    expect(foreign.status).toBe(404);
    expect((await new TestClient().json(`/api/v1/campaigns/${mine.id}`)).status).toBe(401);
    const key = await createApiKey(northwind, ["read"]);
    const byKey = await fetch(new URL(`/api/v1/campaigns/${mine.id}`, northwind.admin.client.baseUrl), { headers: { authorization: `Bearer ${key.key}` } });
    expect(byKey.status).toBe(200);
    const ingestOnly = await createApiKey(northwind, ["ingest"]);
    const refused = await fetch(new URL(`/api/v1/campaigns/${mine.id}`, northwind.admin.client.baseUrl), { headers: { authorization: `Bearer ${ingestOnly.key}` } });
    expect(refused.status).toBe(403);
  });
});

describe("PATCH /api/v1/campaigns/:id", () => {
  it("moves draft → running → paused → running → ended → archived, and refuses a move the lifecycle forbids (409)", async () => {
    const campaign = await createCampaign(northwind);
    const move = (status: string) => northwind.marketer.client.json<CampaignDto>(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { status } });
    expect((await move("ended")).status).toBe(409);
    for (const status of ["running", "paused", "running", "ended"]) {
      const moved = await move(status);
      expect(moved.status).toBe(200);
      expect(moved.body.status).toBe(status);
    }
    expect((await move("running")).status).toBe(409);
    expect((await move("archived")).body.status).toBe("archived");
    expect((await move("draft")).status).toBe(409);
    expect((await northwind.marketer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { name: "Renamed" } })).status).toBe(409);
    const audit = await getDb().select().from(auditEvents).where(and(eq(auditEvents.targetId, campaign.id), eq(auditEvents.action, "campaign.status")));
    expect(audit).toHaveLength(5);
  });

  it("refuses the unauthenticated (401), a viewer or lead (403), another workspace (404) and bad input (422)", async () => {
    const campaign = await createCampaign(northwind);
    const url = `/api/v1/campaigns/${campaign.id}`;
    expect((await new TestClient().json(url, { method: "PATCH", json: { status: "running" } })).status).toBe(401);
    expect((await northwind.viewer.client.json(url, { method: "PATCH", json: { status: "running" } })).status).toBe(403);
    expect((await northwind.lead.client.json(url, { method: "PATCH", json: { name: "Lead's name" } })).status).toBe(403);
    expect((await other.admin.client.json(url, { method: "PATCH", json: { status: "running" } })).status).toBe(404);
    expect((await northwind.marketer.client.json(url, { method: "PATCH", json: { status: "finished" } })).status).toBe(422);
    expect((await northwind.marketer.client.json(url, { method: "PATCH", json: {} })).status).toBe(422);
    expect((await northwind.marketer.client.json(`/api/v1/campaigns/${randomUUID()}`, { method: "PATCH", json: { status: "running" } })).status).toBe(404);
  });

  it("lets the plan change freely before counts, then locks it: refused for a marketer (409), an admin needs a reason, and the change is audited and marked", async () => {
    const key = await createApiKey(northwind, ["ingest"]);
    const campaign = await createCampaign(northwind);
    const url = `/api/v1/campaigns/${campaign.id}`;
    const plan = {
      metric: { kind: "conversion", name: "First purchase" },
      baselineRate: 0.05,
      minimumLift: 0.15,
      alpha: 0.05,
      power: 0.8,
      sides: 2,
      arms: [
        { key: "holdout", name: "Holdout", share: 0.2 },
        { key: "treatment", name: "Spring e-mail", share: 0.8 },
      ],
    };
    const early = await northwind.marketer.client.json<CampaignDto>(url, { method: "PATCH", json: { plan } });
    expect(early.status).toBe(200);
    expect(early.body.minimumLift).toBe(0.15);
    expect(early.body.planChangedAt).toBeNull();
    expect(early.body.tau).toBeCloseTo(computePlan(plan as never, 20_000).tau, 12);

    const pushed = await pushCounts(key.key, [countRow(campaign.id, "holdout", dayFromToday(-5), 100, 5), countRow(campaign.id, "treatment", dayFromToday(-5), 400, 24)]);
    expect(pushed.status).toBe(200);
    const later = { ...plan, alpha: 0.1 };
    const marketer = await northwind.marketer.client.json<{ locked: boolean }>(url, { method: "PATCH", json: { plan: later } });
    expect(marketer.status).toBe(409);
    expect(marketer.body.locked).toBe(true);
    const noReason = await northwind.admin.client.json<{ errors: { pointer: string }[] }>(url, { method: "PATCH", json: { plan: later } });
    expect(noReason.status).toBe(422);
    expect(noReason.body.errors[0].pointer).toBe("/reason");
    const start = await northwind.marketer.client.json(url, { method: "PATCH", json: { startDate: dayFromToday(-3) } });
    expect(start.status).toBe(409);
    // Details stay editable.
    expect((await northwind.marketer.client.json(url, { method: "PATCH", json: { hypothesis: "Now with a clearer hypothesis." } })).status).toBe(200);

    const reason = "Finance asked for α = 0.10 after the first week; agreed with the growth lead.";
    const admin = await northwind.admin.client.json<CampaignDto>(url, { method: "PATCH", json: { plan: later, reason } });
    expect(admin.status).toBe(200);
    expect(admin.body.alpha).toBe(0.1);
    expect(admin.body.planChangedAt).not.toBeNull();
    expect(admin.body.tau).not.toBe(early.body.tau);
    const [event] = await getDb().select().from(auditEvents).where(and(eq(auditEvents.targetId, campaign.id), eq(auditEvents.action, "campaign.plan_change")));
    expect(event.reason).toBe(reason);
    expect(event.actorUserId).toBe(northwind.admin.id);
    const status = await northwind.viewer.client.json<{ planChangedAt: string | null }>(`${url}/status`);
    expect(status.body.planChangedAt).toBe(admin.body.planChangedAt);
  });
});

describe("GET /api/v1/campaigns/:id/status and /series", () => {
  it("answers the documented shape, from the worker's analysis of the stored counts", async () => {
    const key = await createApiKey(northwind, ["ingest"]);
    const campaign = await createCampaign(northwind, { startDate: dayFromToday(-3) });
    const empty = await northwind.viewer.client.json<Record<string, unknown>>(`/api/v1/campaigns/${campaign.id}/status`);
    expect(empty.status).toBe(200);
    expect(empty.body).toMatchObject({ id: campaign.id, call: "collecting", asOf: null, daysRun: 0 });
    const rows = [-3, -2, -1].flatMap((offset) => [
      countRow(campaign.slug, "holdout", dayFromToday(offset), 1_000, 50),
      countRow(campaign.slug, "treatment", dayFromToday(offset), 9_000, 540),
    ]);
    expect((await pushCounts(key.key, rows)).status).toBe(200);
    // The numbers are the worker's: none until it has analysed the running campaign.
    const waiting = await northwind.viewer.client.json<Record<string, unknown>>(`/api/v1/campaigns/${campaign.id}/status`);
    expect(waiting.body).toMatchObject({ call: "collecting", asOf: null, daysRun: 0, analyzedAt: null, stale: true, lift: { absolute: null, relative: null, cs: null, ci: null } });
    expect((await northwind.marketer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { status: "running" } })).status).toBe(200);
    await runRecompute({ wait: true, workspaceIds: [northwind.id] });
    const status = await northwind.viewer.client.json<{
      call: string;
      asOf: string;
      daysRun: number;
      lift: { absolute: number; relative: number; cs: [number, number]; ci: [number, number] };
      sequential: { p: number };
      fixed: { p: number; horizonReached: boolean };
      health: { srmP: number; issues: unknown[] };
      updatedAt: string;
      analyzedAt: string;
      stale: boolean;
    }>(`/api/v1/campaigns/${campaign.id}/status`);
    expect(status.body.asOf).toBe(dayFromToday(-1));
    expect(status.body.daysRun).toBe(3);
    expect(status.body.lift.absolute).toBeCloseTo(0.06 - 0.05, 12);
    expect(status.body.lift.relative).toBeCloseTo(0.2, 12);
    expect(status.body.lift.cs[0]).toBeLessThan(status.body.lift.ci[0]);
    expect(status.body.sequential.p).toBeGreaterThan(0);
    expect(status.body.fixed.horizonReached).toBe(false);
    expect(status.body.health.issues).toEqual([]);
    expect(status.body).toMatchObject({ analyzedAt: expect.any(String), stale: false });
    const series = await northwind.viewer.client.json<{ days: { date: string; daysRun: number }[]; analyzedAt: string; stale: boolean }>(`/api/v1/campaigns/${campaign.id}/series`);
    expect(series.body.days.map((day) => day.daysRun)).toEqual([1, 2, 3]);
    expect(series.body).toMatchObject({ analyzedAt: status.body.analyzedAt, stale: false });
    expect((await other.viewer.client.json(`/api/v1/campaigns/${campaign.id}/status`)).status).toBe(404);
    expect((await new TestClient().json(`/api/v1/campaigns/${campaign.id}/series`)).status).toBe(401);
  });
});
