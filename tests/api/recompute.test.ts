import { describe, expect, it } from "vitest";
import { TestClient } from "../helpers/http-client";
import { createWorkspaceWithRoles } from "../factories";
import { conversionCounts, createWorkerCampaign, putCounts } from "../helpers/worker-fixtures";

describe("POST /api/v1/campaigns/:id/recompute and the subscription routes", () => {
  it("recomputes for admins and leads only, within their workspace", async () => {
    const workspace = await createWorkspaceWithRoles();
    const other = await createWorkspaceWithRoles("Northwind Outfitters EU");
    const campaign = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id });
    await putCounts(campaign, conversionCounts(4, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } }));
    const path = `/api/v1/campaigns/${campaign.id}/recompute`;

    expect((await new TestClient().fetch(path, { method: "POST" })).status).toBe(401);
    expect((await workspace.viewer.client.fetch(path, { method: "POST" })).status).toBe(403);
    expect((await workspace.marketer.client.fetch(path, { method: "POST" })).status).toBe(403);
    expect((await other.admin.client.fetch(path, { method: "POST" })).status).toBe(404);
    expect((await workspace.lead.client.fetch(path, { method: "POST", headers: { origin: "http://evil.example" } })).status).toBe(403);
    expect((await workspace.lead.client.fetch("/api/v1/campaigns/%20/recompute", { method: "POST" })).status).toBe(422);

    const before = await workspace.viewer.client.json<{ analyzedAt: string | null; pending: boolean }>(path);
    expect(before.status).toBe(200);
    expect(before.body).toMatchObject({ analyzedAt: null, pending: true });

    const ran = await workspace.lead.client.json<{ days: number; call: string; analyzedAt: string }>(path, { method: "POST" });
    expect(ran.status).toBe(200);
    expect(ran.body).toMatchObject({ days: 4, call: "collecting", analyzedAt: expect.any(String) });
    const admin = await workspace.admin.client.json(path, { method: "POST" });
    expect(admin.status).toBe(200);
    const after = await workspace.viewer.client.json<{ analyzedAt: string | null; pending: boolean; days: number }>(path);
    expect(after.body).toMatchObject({ pending: false, days: 4 });
  });

  it("lets any reader subscribe and unsubscribe themselves; the creator and default roles start subscribed", async () => {
    const workspace = await createWorkspaceWithRoles();
    const other = await createWorkspaceWithRoles("Northwind Outfitters EU");
    const campaign = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id });
    const path = `/api/v1/campaigns/${campaign.id}/subscription`;

    expect((await new TestClient().fetch(path, { method: "PUT" })).status).toBe(401);
    expect((await other.viewer.client.fetch(path, { method: "PUT" })).status).toBe(404);
    expect((await workspace.viewer.client.fetch(path, { method: "PUT", headers: { origin: "http://evil.example" } })).status).toBe(403);

    expect((await workspace.marketer.client.json(path)).body).toMatchObject({ subscribed: true, reason: "creator" });
    expect((await workspace.lead.client.json(path)).body).toMatchObject({ subscribed: true, reason: "default-recipient" });
    expect((await workspace.viewer.client.json(path)).body).toMatchObject({ subscribed: false, reason: "none" });
    expect((await workspace.viewer.client.json(path, { method: "PUT" })).body).toMatchObject({ subscribed: true, reason: "subscribed" });
    expect((await workspace.admin.client.json(path, { method: "DELETE" })).body).toMatchObject({ subscribed: false, reason: "unsubscribed" });
  });
});
