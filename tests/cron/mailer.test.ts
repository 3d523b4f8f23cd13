import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runMailer } from "@/cron/mailer";
import { recomputeCampaign } from "@/cron/recompute";
import { getDb } from "@/db";
import { listAnalysisDays } from "@/db/queries/analysis";
import { listCampaignAlerts, listDeliveries } from "@/db/queries/alerts";
import { alerts } from "@/db/schema";
import { formatPValue, formatRelative } from "@/lib/alerts/format";
import { resetTransport } from "@/lib/mail/transport";
import { startMailCatcher, type CapturedMail, type MailCatcher } from "../../scripts/lib/mail-catcher";
import { freePort } from "../../scripts/lib/postgres-cluster";
import { createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { conversionCounts, createWorkerCampaign, putCounts, type WorkerCampaign } from "../helpers/worker-fixtures";

// This file sends over real SMTP to a catcher of its own, so it can take that server down and up again.
let catcher: MailCatcher;
let ports: { smtpPort: number; httpPort: number };

beforeAll(async () => {
  ports = { smtpPort: await freePort(), httpPort: await freePort() };
  catcher = await startMailCatcher(ports);
  process.env.SMTP_URL = `smtp://127.0.0.1:${ports.smtpPort}`;
  resetTransport();
});
afterAll(async () => {
  resetTransport();
  await catcher.stop();
});

function mailTo(email: string): CapturedMail[] {
  return catcher.messages.filter((mail) => mail.envelopeTo.includes(email));
}

function recipientsOf(workspace: TestWorkspace): string[] {
  return [workspace.admin.email, workspace.lead.email, workspace.marketer.email, workspace.viewer.email];
}

const quiet = { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } };
const lifting = { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.065 } };

/** A workspace with one member per role; the marketer created the campaign, the viewer subscribed through the API. */
async function campaignWithFollowers(): Promise<{ workspace: TestWorkspace; campaign: WorkerCampaign }> {
  const workspace = await createWorkspaceWithRoles();
  const campaign = await createWorkerCampaign({ workspaceId: workspace.id, createdBy: workspace.marketer.id });
  const subscribed = await workspace.viewer.client.json<{ subscribed: boolean; reason: string }>(`/api/v1/campaigns/${campaign.id}/subscription`, { method: "PUT" });
  expect(subscribed.status).toBe(200);
  expect(subscribed.body).toEqual({ campaignId: campaign.id, subscribed: true, reason: "subscribed" });
  return { workspace, campaign };
}

describe("alerts by e-mail", () => {
  it("mails one alert per subscriber when the call crosses, nothing on a re-run, and the next alert after a correction", async () => {
    const { workspace, campaign } = await campaignWithFollowers();
    await putCounts(campaign, conversionCounts(2, lifting));
    expect((await recomputeCampaign(campaign.id)).call).toBe("collecting");
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    for (const email of recipientsOf(workspace)) expect(mailTo(email)).toHaveLength(0);

    await putCounts(campaign, conversionCounts(3, lifting, 2));
    const crossed = await recomputeCampaign(campaign.id);
    expect(crossed).toMatchObject({ call: "lift", previousCall: "collecting", alertId: expect.any(String) });
    const mailer = await runMailer({ wait: true, workspaceIds: [workspace.id] });
    expect(mailer.ran).toBe(true);

    const last = (await listAnalysisDays(campaign.id)).at(-1)!;
    const deliveries = await listDeliveries([crossed.alertId!]);
    expect(deliveries.map((d) => d.email).sort()).toEqual(recipientsOf(workspace).sort());
    for (const email of recipientsOf(workspace)) {
      const mails = mailTo(email);
      expect(mails).toHaveLength(1);
      const [mail] = mails;
      expect(mail.subject).toBe(`${campaign.name}: Lift proven — Stop and ship`);
      expect(mail.text).toContain(`Always-valid p-value: ${formatPValue(last.sequentialP)}`);
      expect(mail.text).toContain(`Naive p-value (fixed-horizon test read today): ${formatPValue(last.fixedP)}`);
      expect(mail.text).toContain(`Lift, relative: ${formatRelative(last.liftRelative)}`);
      expect(mail.text).toContain(`Days run: ${last.daysRun} of 28`);
      expect(mail.text).toContain(`${process.env.APP_URL}/campaigns/${campaign.id}`);
      expect(mail.text).toContain(`${process.env.APP_URL}/unsubscribe?token=`);
      expect(mail.text).toContain("Units were assigned to the arms at random");
      expect(mail.html).toContain("Lift proven");
      const delivery = deliveries.find((d) => d.email === email)!;
      expect(mail.messageId).toBe(`<alert-${delivery.id}@127.0.0.1>`);
    }
    const [sentAlert] = await getDb().select().from(alerts).where(eq(alerts.id, crossed.alertId!));
    expect(sentAlert.sentAt).not.toBeNull();

    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    expect((await recomputeCampaign(campaign.id)).alertId).toBeNull();
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    for (const email of recipientsOf(workspace)) expect(mailTo(email)).toHaveLength(1);

    // A resend of every day with no lift moves the call back: the next alert goes out.
    await putCounts(campaign, conversionCounts(5, quiet));
    const corrected = await recomputeCampaign(campaign.id);
    expect(corrected).toMatchObject({ call: "collecting", previousCall: "lift", alertId: expect.any(String) });
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    for (const email of recipientsOf(workspace)) {
      const mails = mailTo(email);
      expect(mails).toHaveLength(2);
      expect(mails.some((mail) => mail.subject === `${campaign.name}: Collecting evidence — Keep running`)).toBe(true);
    }
    expect(await listCampaignAlerts(campaign.id)).toHaveLength(2);
  });

  it("keeps alerts with their attempts while SMTP is down and delivers each once when it is back", async () => {
    const { workspace, campaign } = await campaignWithFollowers();
    await catcher.stop();
    try {
      await putCounts(campaign, conversionCounts(5, lifting));
      const crossed = await recomputeCampaign(campaign.id);
      expect(crossed.alertId).not.toBeNull();
      const first = await runMailer({ wait: true, workspaceIds: [workspace.id] });
      expect(first.failed).toBeGreaterThanOrEqual(4);
      const later = new Date(Date.now() + 2 * 60 * 60 * 1000);
      await runMailer({ wait: true, workspaceIds: [workspace.id], now: later });
      const deliveries = await listDeliveries([crossed.alertId!]);
      expect(deliveries).toHaveLength(4);
      for (const delivery of deliveries) {
        expect(delivery.sentAt).toBeNull();
        expect(delivery.attempts).toBe(2);
        expect(delivery.lastError).toMatch(/ECONNREFUSED|connect/i);
      }
      const [pending] = await getDb().select().from(alerts).where(eq(alerts.id, crossed.alertId!));
      expect(pending).toMatchObject({ sentAt: null, attempts: 2 });
      expect(pending.lastError).toBeTruthy();
    } finally {
      catcher = await startMailCatcher(ports);
      resetTransport();
    }
    await runMailer({ wait: true, workspaceIds: [workspace.id], now: new Date(Date.now() + 6 * 60 * 60 * 1000) });
    await runMailer({ wait: true, workspaceIds: [workspace.id], now: new Date(Date.now() + 12 * 60 * 60 * 1000) });
    for (const email of recipientsOf(workspace)) expect(mailTo(email)).toHaveLength(1);
    const alertRows = await listCampaignAlerts(campaign.id);
    const deliveries = await listDeliveries(alertRows.map((a) => a.id));
    expect(deliveries.every((d) => d.sentAt !== null && d.attempts === 3)).toBe(true);
  });

  it("stops further mail for a campaign through the unsubscribe link; a tampered token is refused", async () => {
    const { workspace, campaign } = await campaignWithFollowers();
    await putCounts(campaign, conversionCounts(5, lifting));
    await recomputeCampaign(campaign.id);
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    const [mail] = mailTo(workspace.lead.email);
    const link = mail.text.match(/https?:\/\/\S+\/unsubscribe\?token=[A-Za-z0-9_.-]+/)![0];
    const token = new URL(link).searchParams.get("token")!;

    const page = await fetch(link);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Stop alerts for this campaign");
    expect(html).toContain(campaign.name);

    const tampered = token.slice(0, -2) + (token.endsWith("AA") ? "BB" : "AA");
    const refused = await fetch(`${process.env.APP_URL}/unsubscribe/confirm`, { method: "POST", body: new URLSearchParams({ token: tampered }) });
    expect(refused.status).toBe(400);
    // A body that claims to be a form and is not one (found by soak:fuzz: it answered 500) carries no token.
    const broken = await fetch(`${process.env.APP_URL}/unsubscribe/confirm`, {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=x" },
      body: '{"name":"Trail"}',
    });
    expect(broken.status).toBe(400);
    expect(broken.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    const tamperedPage = await fetch(`${process.env.APP_URL}/unsubscribe?token=${encodeURIComponent(tampered)}`);
    expect(await tamperedPage.text()).toContain("This link does not work");

    const confirmed = await fetch(`${process.env.APP_URL}/unsubscribe/confirm`, { method: "POST", body: new URLSearchParams({ token }) });
    expect(confirmed.status).toBe(200);
    expect(await confirmed.json()).toEqual({ unsubscribed: true, campaignId: campaign.id });
    const state = await workspace.lead.client.json<{ subscribed: boolean; reason: string }>(`/api/v1/campaigns/${campaign.id}/subscription`);
    expect(state.body).toMatchObject({ subscribed: false, reason: "unsubscribed" });

    await putCounts(campaign, conversionCounts(5, quiet));
    const next = await recomputeCampaign(campaign.id);
    expect(next.alertId).not.toBeNull();
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    expect(mailTo(workspace.lead.email)).toHaveLength(1);
    expect(mailTo(workspace.admin.email)).toHaveLength(2);
    const deliveries = await listDeliveries([next.alertId!]);
    expect(deliveries.map((d) => d.email)).not.toContain(workspace.lead.email);
  });
});
