import { beforeAll, describe, expect, test } from "vitest";
import { runMailer } from "@/cron/mailer";
import { recomputeCampaign } from "@/cron/recompute";
import { DEFAULT_ALERT_RULE, getAlertRule } from "@/db/queries/alert-rules";
import { listCampaignAlerts, listDeliveries } from "@/db/queries/alerts";
import { createUser, createWorkspace, createWorkspaceWithRoles, uniqueEmail, type TestUser, type TestWorkspace } from "../factories";
import { TestClient } from "../helpers/http-client";
import { listMail } from "../helpers/mail";
import { actionId, parseFlightResult, type ActionResult as ServerActionResult } from "../helpers/server-actions";
import { conversionCounts, createWorkerCampaign, putCounts } from "../helpers/worker-fixtures";

type ActionResult = ServerActionResult<Record<string, unknown>>;

let updateRulesId: string;

async function saveRules(client: TestClient, input: unknown): Promise<{ redirect: string | null; result: ActionResult | null }> {
  const response = await client.fetch("/settings/alerts", {
    method: "POST",
    headers: { "next-action": updateRulesId, "content-type": "text/plain;charset=UTF-8", accept: "text/x-component" },
    body: JSON.stringify([input]),
  });
  const redirect = response.headers.get("x-action-redirect") ?? response.headers.get("location");
  const text = await response.text();
  return { redirect, result: response.headers.get("content-type")?.includes("text/x-component") ? parseFlightResult<Record<string, unknown>>(text) : null };
}

const valid = {
  calls: ["harm", "lift"],
  defaultRecipientRoles: ["lead"],
  extraRecipients: "Growth-Alerts@northwind-outfitters.example, ops@northwind-outfitters.example\ngrowth-alerts@northwind-outfitters.example",
  dailyDigest: true,
};

let team: TestWorkspace;
let otherAdmin: TestUser;
let otherWorkspaceId: string;

beforeAll(async () => {
  updateRulesId = actionId("updateAlertRuleAction", "settings/alerts/actions");
  team = await createWorkspaceWithRoles("Northwind Outfitters");
  otherAdmin = await createUser({ email: uniqueEmail("other-admin") });
  otherWorkspaceId = await createWorkspace(otherAdmin, "Northwind Rentals");
});

describe("updateAlertRuleAction", () => {
  test("refuses a caller who is not signed in (redirect to sign-in) and changes nothing", async () => {
    const response = await saveRules(new TestClient(), valid);
    expect(response.result?.ok).not.toBe(true);
    expect(response.redirect).toMatch(/\/sign-in/);
    expect(await getAlertRule(team.id)).toEqual({ workspaceId: team.id, ...DEFAULT_ALERT_RULE });
  });

  test.each(["viewer", "marketer"] as const)("refuses a %s and changes nothing", async (role) => {
    const response = await saveRules(team[role].client, valid);
    expect(response.result).toMatchObject({ ok: false, error: expect.stringMatching(/only admins and leads/) });
    expect(await getAlertRule(team.id)).toEqual({ workspaceId: team.id, ...DEFAULT_ALERT_RULE });
  });

  test("an admin of another workspace changes only their own workspace's rules, and cannot name ours", async () => {
    const own = await saveRules(otherAdmin.client, { ...valid, dailyDigest: false, calls: ["harm"] });
    expect(own.result).toMatchObject({ ok: true, data: { workspaceId: otherWorkspaceId, calls: ["harm"] } });
    const aimed = await saveRules(otherAdmin.client, { ...valid, workspaceId: team.id });
    expect(aimed.result).toMatchObject({ ok: false });
    expect(await getAlertRule(team.id)).toEqual({ workspaceId: team.id, ...DEFAULT_ALERT_RULE });
  });

  test.each([
    ["an address that is not one", { extraRecipients: "growth-alerts@northwind, someone" }, "extraRecipients"],
    ["too many addresses", { extraRecipients: Array.from({ length: 21 }, (_, i) => `person${i}@northwind-outfitters.example`).join("\n") }, "extraRecipients"],
    ["an unknown call", { calls: ["lift", "maybe"] }, "calls"],
    ["an unknown role", { defaultRecipientRoles: ["owner"] }, "defaultRecipientRoles"],
    ["a digest that is not on or off", { dailyDigest: "yes" }, "dailyDigest"],
  ])("answers invalid input (%s) with field errors and changes nothing", async (_label, patch, field) => {
    const response = await saveRules(team.lead.client, { ...valid, ...patch });
    expect(response.result).toMatchObject({ ok: false, fieldErrors: { [field]: [expect.any(String)] } });
    expect(await getAlertRule(team.id)).toEqual({ workspaceId: team.id, ...DEFAULT_ALERT_RULE });
  });
});

describe("the saved rules decide who is mailed", () => {
  test("a lead saves them; an alert of a call the rules exclude is not mailed, an included one reaches only the chosen recipients", async () => {
    const saved = await saveRules(team.lead.client, { ...valid, calls: ["harm"] });
    expect(saved.result).toEqual({
      ok: true,
      data: {
        workspaceId: team.id,
        calls: ["harm"],
        defaultRecipientRoles: ["lead"],
        extraRecipients: ["growth-alerts@northwind-outfitters.example", "ops@northwind-outfitters.example"],
        dailyDigest: true,
      },
    });
    const lifting = { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.066 } };

    const excluded = await createWorkerCampaign({ workspaceId: team.id, createdBy: team.marketer.id, name: "Trail shoe spring e-mail" });
    await putCounts(excluded, conversionCounts(6, lifting));
    expect((await recomputeCampaign(excluded.id)).call).toBe("lift");
    const [excludedAlert] = await listCampaignAlerts(excluded.id);
    await runMailer({ wait: true, workspaceIds: [team.id] });
    expect((await listMail()).filter((mail) => mail.headers["x-peeksafe-alert"] === excludedAlert.id)).toEqual([]);
    expect(await listDeliveries([excludedAlert.id])).toEqual([]);
    const [closed] = await listCampaignAlerts(excluded.id);
    expect(closed.sentAt).not.toBeNull();
    expect(closed.lastError).toMatch(/do not mail "lift"/);

    // The admin adds "lift": the next crossing is mailed to the lead, the creator and the extra addresses, not the admin.
    expect((await saveRules(team.admin.client, { ...valid, calls: ["harm", "lift"] })).result).toMatchObject({ ok: true });
    const included = await createWorkerCampaign({ workspaceId: team.id, createdBy: team.marketer.id, name: "Rain jacket push test" });
    await putCounts(included, conversionCounts(6, lifting));
    expect((await recomputeCampaign(included.id)).call).toBe("lift");
    const [includedAlert] = await listCampaignAlerts(included.id);
    await runMailer({ wait: true, workspaceIds: [team.id] });
    const mailed = (await listMail()).filter((mail) => mail.headers["x-peeksafe-alert"] === includedAlert.id).flatMap((mail) => mail.envelopeTo);
    expect(mailed.sort()).toEqual(
      [team.lead.email, team.marketer.email, "growth-alerts@northwind-outfitters.example", "ops@northwind-outfitters.example"].map((email) => email.toLowerCase()).sort(),
    );
  });
});
