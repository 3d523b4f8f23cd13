import { beforeAll, describe, expect, it } from "vitest";
import type { PortfolioRow } from "@/db/queries/portfolio";
import type { PlannerResult } from "@/lib/planner/plan-design";
import { sampleSizeTwoProportions } from "@/lib/sequential";
import { TestClient } from "../helpers/http-client";
import { createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { createCampaign } from "../factories-campaigns";

let northwind: TestWorkspace;
let other: TestWorkspace;

beforeAll(async () => {
  [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
});

describe("GET /api/v1/planner", () => {
  const url = "/api/v1/planner?baseline=0.05&minimumLift=0.1&dailyUnits=20000&holdoutShare=0.1";

  it("answers the fixed horizon (lib/sequential's sample size) and four simulated scenarios to every member", async () => {
    const response = await northwind.viewer.client.json<PlannerResult>(url);
    expect(response.status).toBe(200);
    const size = sampleSizeTwoProportions({ baselineRate: 0.05, minimumLift: 0.1, significanceLevel: 0.05, power: 0.8, sides: 2, holdoutShare: 0.1 });
    expect(response.body.fixed.perArm).toEqual({ holdout: size.holdout, treatment: size.treatment });
    expect(response.body.scenarios.map((scenario) => scenario.multiple)).toEqual([0, 0.5, 1, 2]);
    expect(response.body.method).toMatch(/Seeded simulation/);
  });

  it("refuses the unauthenticated (401) and rejects an impossible plan (422)", async () => {
    expect((await new TestClient().json(url)).status).toBe(401);
    expect((await northwind.lead.client.json("/api/v1/planner?baseline=1.5&minimumLift=0.1&dailyUnits=20000")).status).toBe(422);
    expect((await northwind.lead.client.json("/api/v1/planner?baseline=0.05&minimumLift=-1&dailyUnits=20000")).status).toBe(422);
  });
});

describe("GET /api/v1/portfolio", () => {
  it("lists the workspace's campaigns with their call, and no other workspace's", async () => {
    const mine = await createCampaign(northwind, { name: "Tent weekend promo" });
    await createCampaign(other, { name: "Other workspace's promo" });
    const response = await northwind.viewer.client.json<{ campaigns: PortfolioRow[] }>("/api/v1/portfolio");
    expect(response.status).toBe(200);
    expect(response.body.campaigns.map((row) => row.id)).toEqual([mine.id]);
    expect(response.body.campaigns[0]).toMatchObject({ call: "collecting", status: "draft", daysRun: null, trend: [] });
  });

  it("refuses the unauthenticated (401)", async () => {
    expect((await new TestClient().json("/api/v1/portfolio")).status).toBe(401);
  });
});
