import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import { auditEvents } from "@/db/schema";
import { TestClient } from "../helpers/http-client";
import { createApiKey, createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { createCampaign } from "../factories-campaigns";

let northwind: TestWorkspace;
let other: TestWorkspace;

async function runningCampaign(workspace: TestWorkspace, name: string): Promise<CampaignDto> {
  const campaign = await createCampaign(workspace, { name });
  const moved = await workspace.marketer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { status: "running" } });
  expect(moved.status).toBe(200);
  return campaign;
}

const decisionsUrl = (campaign: CampaignDto) => `/api/v1/campaigns/${campaign.id}/decisions`;

beforeAll(async () => {
  [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
});

describe("POST /api/v1/campaigns/:id/decisions", () => {
  it("a lead ships: the decision is stored with the call, the campaign ends, an audit event is written", async () => {
    const campaign = await runningCampaign(northwind, "Trail shoe spring e-mail");
    const recorded = await northwind.lead.client.json<Record<string, unknown>>(decisionsUrl(campaign), {
      method: "POST",
      json: { outcome: "ship", note: "Lift proven on day 12; ship to every subscriber." },
    });
    expect(recorded.status).toBe(201);
    expect(recorded.body).toMatchObject({ outcome: "ship", callAtDecision: "collecting", campaignStatus: "ended" });
    const read = await northwind.viewer.client.json<{ status: string; decisions: { outcome: string; note: string; decidedBy: { name: string } }[]; alerts: unknown[] }>(decisionsUrl(campaign));
    expect(read.status).toBe(200);
    expect(read.body.status).toBe("ended");
    expect(read.body.decisions.map((decision) => decision.outcome)).toEqual(["ship"]);
    expect(read.body.decisions[0].decidedBy.name).toBeTruthy();
    expect(read.body.alerts).toEqual([]);
    const audit = await getDb().select().from(auditEvents).where(and(eq(auditEvents.targetId, campaign.id), eq(auditEvents.action, "campaign.decision")));
    expect(audit).toHaveLength(1);
    expect(audit[0].reason).toBe("Lift proven on day 12; ship to every subscriber.");
    const again = await northwind.lead.client.json(decisionsUrl(campaign), { method: "POST", json: { outcome: "stop", note: "A second decision on an ended campaign." } });
    expect(again.status).toBe(409);
  });

  it("extend keeps the campaign running; an admin may decide too", async () => {
    const campaign = await runningCampaign(northwind, "Winter jacket push nudge");
    const extended = await northwind.admin.client.json<{ campaignStatus: string }>(decisionsUrl(campaign), {
      method: "POST",
      json: { outcome: "extend", note: "Collecting evidence; keep it two more weeks." },
    });
    expect(extended.status).toBe(201);
    expect(extended.body.campaignStatus).toBe("running");
    const rolled = await northwind.lead.client.json<{ campaignStatus: string }>(decisionsUrl(campaign), { method: "POST", json: { outcome: "roll_back", note: "Harm proven: roll the push back." } });
    expect(rolled.body.campaignStatus).toBe("ended");
  });

  it("a draft takes no decision (409)", async () => {
    const campaign = await createCampaign(northwind, { name: "Camp stove draft" });
    const response = await northwind.lead.client.json(decisionsUrl(campaign), { method: "POST", json: { outcome: "stop", note: "Never started, stop it." } });
    expect(response.status).toBe(409);
  });

  it("refuses the unauthenticated (401), a marketer or viewer (403), a pipeline key (403) and another workspace (404)", async () => {
    const campaign = await runningCampaign(northwind, "Free-shipping banner");
    const body = { outcome: "stop", note: "Not worth waiting any longer." };
    expect((await new TestClient().json(decisionsUrl(campaign), { method: "POST", json: body })).status).toBe(401);
    expect((await new TestClient().json(decisionsUrl(campaign))).status).toBe(401);
    expect((await northwind.marketer.client.json(decisionsUrl(campaign), { method: "POST", json: body })).status).toBe(403);
    expect((await northwind.viewer.client.json(decisionsUrl(campaign), { method: "POST", json: body })).status).toBe(403);
    const key = await createApiKey(northwind, ["ingest", "read"]);
    const keyed = await fetch(new URL(decisionsUrl(campaign), northwind.lead.client.baseUrl), {
      method: "POST",
      headers: { authorization: `Bearer ${key.key}`, "content-type": "application/json" },
      body: JSON.stringify(body),
    });
    expect(keyed.status).toBe(403);
    expect((await other.lead.client.json(decisionsUrl(campaign), { method: "POST", json: body })).status).toBe(404);
    expect((await other.viewer.client.json(decisionsUrl(campaign))).status).toBe(404);
    const read = await northwind.viewer.client.json<{ status: string; decisions: unknown[] }>(decisionsUrl(campaign));
    expect(read.body).toMatchObject({ status: "running", decisions: [] });
  });

  it("rejects invalid input with 422: unknown outcome, short note, extra fields", async () => {
    const campaign = await runningCampaign(northwind, "Headlamp bundle onboarding");
    for (const json of [{ outcome: "celebrate", note: "A note long enough to pass." }, { outcome: "ship", note: "short" }, { outcome: "ship", note: "A note long enough to pass.", status: "archived" }]) {
      const response = await northwind.lead.client.json<{ status: number }>(decisionsUrl(campaign), { method: "POST", json });
      expect(response.status).toBe(422);
    }
    const read = await northwind.lead.client.json<{ decisions: unknown[] }>(decisionsUrl(campaign));
    expect(read.body.decisions).toEqual([]);
  });
});
