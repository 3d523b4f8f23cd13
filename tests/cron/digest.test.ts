import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { localDay, runDigest } from "@/cron/digest";
import { recomputeCampaign } from "@/cron/recompute";
import { getDb } from "@/db";
import { DEFAULT_ALERT_RULE, updateAlertRule } from "@/db/queries/alert-rules";
import { setSubscription } from "@/db/queries/subscriptions";
import { campaigns } from "@/db/schema";
import { CALL_WORDS } from "@/lib/alerts/call-words";
import { createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { listMail } from "../helpers/mail";
import { conversionCounts, createWorkerCampaign, putCounts } from "../helpers/worker-fixtures";

const EXTRA = "growth-alerts@northwind-outfitters.example";

async function digestsTo(email: string) {
  return (await listMail()).filter((mail) => mail.envelopeTo.includes(email.toLowerCase()) && (mail.messageId ?? "").startsWith("<digest-"));
}

/** A workspace with two running campaigns (one lifting, one quiet), a paused one, and the viewer subscribed to the quiet one. */
async function workspaceWithCampaigns(): Promise<{ workspace: TestWorkspace; running: { name: string; call: keyof typeof CALL_WORDS }[]; paused: string }> {
  const workspace = await createWorkspaceWithRoles("Northwind Outfitters");
  const lifting = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id, name: "Trail shoe spring e-mail" });
  await putCounts(lifting, conversionCounts(6, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.066 } }));
  const quiet = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id, name: "Rain jacket push test" });
  await putCounts(quiet, conversionCounts(3, { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } }));
  const paused = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id, name: "Tent weekend promo" });
  await getDb().update(campaigns).set({ status: "paused" }).where(eq(campaigns.id, paused.id));
  const liftCall = (await recomputeCampaign(lifting.id)).call!;
  const quietCall = (await recomputeCampaign(quiet.id)).call!;
  expect([liftCall, quietCall]).toEqual(["lift", "collecting"]);
  await setSubscription(quiet.id, workspace.viewer.id, true);
  return {
    workspace,
    // The digest lists running campaigns by name.
    running: [
      { name: "Rain jacket push test", call: quietCall },
      { name: "Trail shoe spring e-mail", call: liftCall },
    ],
    paused: paused.name,
  };
}

describe("the daily digest", () => {
  it("mails each follower once a day, listing every running campaign's call; a re-run the same day sends nothing new", async () => {
    const { workspace, running, paused } = await workspaceWithCampaigns();
    await updateAlertRule({ workspaceId: workspace.id, ...DEFAULT_ALERT_RULE, extraRecipients: [EXTRA], dailyDigest: true });
    const morning = new Date("2026-12-02T07:00:00Z");

    const first = await runDigest({ workspaceIds: [workspace.id], now: morning, wait: true });
    expect(first).toEqual({ ran: true, workspaces: 1, sent: 4, failed: 0 });
    // Admins and leads by role, the marketer as creator, the viewer as a subscriber.
    for (const member of [workspace.admin, workspace.lead, workspace.marketer, workspace.viewer]) {
      const mails = await digestsTo(member.email);
      expect(mails, member.email).toHaveLength(1);
      const [mail] = mails;
      expect(mail.subject).toBe(`Northwind Outfitters: 2 running campaigns on ${localDay(morning, "UTC")}`);
      const listed = mail.text.split("\n").filter((line) => line.startsWith("- "));
      expect(listed.map((line) => line.slice(2, line.indexOf(" (")))).toEqual(running.map((campaign) => `${campaign.name}: ${CALL_WORDS[campaign.call].phrase}`));
      expect(mail.text).not.toContain(paused);
    }
    // Extra addresses get alerts, not the digest (it goes to people who follow campaigns).
    expect(await digestsTo(EXTRA)).toHaveLength(0);

    const again = await runDigest({ workspaceIds: [workspace.id], now: new Date("2026-12-02T19:00:00Z"), wait: true });
    expect(again).toEqual({ ran: true, workspaces: 1, sent: 0, failed: 0 });
    for (const member of [workspace.admin, workspace.lead, workspace.marketer, workspace.viewer]) expect(await digestsTo(member.email)).toHaveLength(1);

    const nextDay = await runDigest({ workspaceIds: [workspace.id], now: new Date("2026-12-03T07:00:00Z"), wait: true });
    expect(nextDay.sent).toBe(4);
    expect(await digestsTo(workspace.viewer.email)).toHaveLength(2);
  });

  it("sends nothing when the rules turn the digest off (the default), or once they turn it off again", async () => {
    const { workspace } = await workspaceWithCampaigns();
    const morning = new Date("2026-12-02T07:00:00Z");
    expect(await runDigest({ workspaceIds: [workspace.id], now: morning, wait: true })).toEqual({ ran: true, workspaces: 0, sent: 0, failed: 0 });

    await updateAlertRule({ workspaceId: workspace.id, ...DEFAULT_ALERT_RULE, dailyDigest: true });
    await updateAlertRule({ workspaceId: workspace.id, ...DEFAULT_ALERT_RULE, dailyDigest: false });
    expect(await runDigest({ workspaceIds: [workspace.id], now: morning, wait: true })).toEqual({ ran: true, workspaces: 0, sent: 0, failed: 0 });
    for (const member of [workspace.admin, workspace.lead, workspace.marketer, workspace.viewer]) expect(await digestsTo(member.email)).toHaveLength(0);
  });
});
