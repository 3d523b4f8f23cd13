import { writeFileSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, inject, test } from "vitest";
import { runMailer } from "@/cron/mailer";
import { runRecompute } from "@/cron/recompute";
import type { CampaignDto } from "@/db/queries/campaigns";
import { createApiKey, createWorkspaceWithRoles, type TestUser, type TestWorkspace } from "../factories";
import { countRow, dayFromToday, pushCounts } from "../factories-campaigns";
import { SCREENSHOT_DIR, describeViolations, openBrowser, screenshot, seriousAxeViolations, type BrowserSession, type OpenBrowserOptions } from "../helpers/browser";
import { linkIn, waitForMail } from "../helpers/mail";

const appUrl = inject("appUrl");
const sessions: BrowserSession[] = [];
const NAME = "Trail shoe spring e-mail";
/** One poll of the campaign page (30 s) plus the time to fetch and draw. */
const ONE_POLL_MS = 40_000;

let workspace: TestWorkspace;
let campaign: CampaignDto;

async function signedInBrowser(user: TestUser, options: OpenBrowserOptions = {}): Promise<BrowserSession> {
  const session = await openBrowser(options);
  sessions.push(session);
  await session.context.addCookies([...user.client.cookies].map(([name, value]) => ({ name, value, url: appUrl })));
  return session;
}

async function expectAccessible(session: BrowserSession, screen: string) {
  const violations = await seriousAxeViolations(session.page);
  expect(violations, `${screen}:\n${describeViolations(violations)}`).toEqual([]);
  await screenshot(session.page, `journey-${screen}`);
}

afterAll(async () => {
  await Promise.all(sessions.map((session) => session.close()));
});

describe.sequential("the growth team's journeys in a real browser", () => {
  test("a marketer registers a campaign through the form and sees the plan's sample size", { timeout: 120_000 }, async () => {
    workspace = await createWorkspaceWithRoles("Northwind Outfitters");
    const marketer = await signedInBrowser(workspace.marketer);
    const { page } = marketer;
    await page.goto(`${appUrl}/campaigns`);
    await page.getByText("No campaigns yet").waitFor();
    await expectAccessible(marketer, "01-portfolio-empty");
    await page.getByRole("link", { name: "Register a campaign" }).click();
    await page.waitForURL(/\/campaigns\/new$/);
    await page.getByLabel("Name").first().fill(NAME);
    const preview = page.getByTestId("plan-preview");
    await expect.poll(() => preview.innerText()).toMatch(/\d[\d,]* units/);
    await expectAccessible(marketer, "02-plan-form");
    await page.getByRole("button", { name: "Register campaign" }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    await page.getByRole("heading", { name: NAME }).waitFor();
    const id = page.url().split("/").at(-1)!;
    const read = await workspace.marketer.client.json<CampaignDto>(`/api/v1/campaigns/${id}`);
    campaign = read.body;
    expect(await page.getByRole("table", { name: "Planned units per arm" }).innerText()).toContain(campaign.plan.perArm.treatment.toLocaleString("en-US"));
    // Start it six days ago so the pipeline has a week of counts to send.
    const moved = await workspace.marketer.client.json(`/api/v1/campaigns/${id}`, { method: "PATCH", json: { startDate: dayFromToday(-6), status: "running" } });
    expect(moved.status).toBe(200);
    expect(marketer.errors).toEqual([]);
  });

  test("the pipeline pushes counts, the worker runs, and the lead's open page shows the new call within one poll, without a reload", { timeout: 150_000 }, async () => {
    const subscribed = await workspace.viewer.client.json(`/api/v1/campaigns/${campaign.id}/subscription`, { method: "PUT" });
    expect(subscribed.status).toBe(200);
    const lead = await signedInBrowser(workspace.lead);
    const { page } = lead;
    const started = Date.now();
    await page.goto(`${appUrl}/campaigns/${campaign.id}`);
    await page.getByTestId("campaign-call").getByText("Collecting evidence").waitFor();
    await page.evaluate(() => ((window as unknown as { journeyMarker: string }).journeyMarker = "same page"));
    await screenshot(page, "journey-03-campaign-before");

    const key = await createApiKey(workspace, ["ingest"]);
    const share = campaign.arms.find((arm) => arm.key === "holdout")!.share;
    const rows = [-6, -5, -4, -3, -2, -1].flatMap((offset) => {
      const total = 20_000;
      const holdout = Math.round(total * share);
      return [countRow(campaign.id, "holdout", dayFromToday(offset), holdout, Math.round(holdout * 0.04)), countRow(campaign.id, "treatment", dayFromToday(offset), total - holdout, Math.round((total - holdout) * 0.055))];
    });
    const pushed = await pushCounts(key.key, rows);
    expect(pushed.status).toBe(200);
    const summary = await runRecompute({ workspaceIds: [workspace.id], wait: true });
    expect(summary.campaigns.find((entry) => entry.campaignId === campaign.id)?.call).toBe("lift");

    await page.getByTestId("campaign-call").getByText("Lift proven").waitFor({ timeout: ONE_POLL_MS });
    expect(await page.evaluate(() => (window as unknown as { journeyMarker?: string }).journeyMarker)).toBe("same page");
    await page.getByTestId("lift-chart").locator("svg.recharts-surface").first().waitFor();
    await page.getByTestId("p-value-chart").locator("svg.recharts-surface").first().waitFor();
    expect(Date.now() - started).toBeLessThan(120_000);
    await expectAccessible(lead, "04-campaign-lift-proven");

    await page.getByRole("button", { name: "Show table" }).first().click();
    await page.getByRole("table", { name: "Lift over time: the numbers" }).waitFor();
    await expectAccessible(lead, "05-campaign-lift-table");
    expect(lead.errors).toEqual([]);
  });

  test("the stakeholder's alert e-mail arrives in the catcher and its link opens the right page", { timeout: 90_000 }, async () => {
    await runMailer({ wait: true, workspaceIds: [workspace.id] });
    const mail = await waitForMail(workspace.viewer.email, (message) => message.text.includes(`/campaigns/${campaign.id}`), 20_000);
    expect(mail.subject).toMatch(/Lift proven/);
    const link = linkIn(mail, `${appUrl}/campaigns/`);
    const viewer = await signedInBrowser(workspace.viewer);
    await viewer.page.goto(link);
    await viewer.page.getByRole("heading", { name: NAME }).waitFor();
    await viewer.page.getByTestId("campaign-call").getByText("Lift proven").waitFor();
    expect(new URL(viewer.page.url()).pathname).toBe(`/campaigns/${campaign.id}`);
    await expectAccessible(viewer, "06-campaign-from-alert-viewer");
    expect(viewer.errors).toEqual([]);
  });

  test("a viewer sees no edit or decision controls, and the server refuses the actions when forced", { timeout: 60_000 }, async () => {
    const viewer = await signedInBrowser(workspace.viewer);
    await viewer.page.goto(`${appUrl}/campaigns/${campaign.id}`);
    await viewer.page.getByRole("heading", { name: NAME }).waitFor();
    await viewer.page.getByRole("heading", { name: "Decision" }).waitFor();
    expect(await viewer.page.getByTestId("decision-form").count()).toBe(0);
    expect(await viewer.page.locator("#csv-file").count()).toBe(0);
    expect(await viewer.page.getByRole("button", { name: /Pause|End|Start|Archive/ }).count()).toBe(0);
    const forcedDecision = await workspace.viewer.client.json(`/api/v1/campaigns/${campaign.id}/decisions`, { method: "POST", json: { outcome: "ship", note: "Forced by a viewer, must fail." } });
    expect(forcedDecision.status).toBe(403);
    const forcedEdit = await workspace.viewer.client.json(`/api/v1/campaigns/${campaign.id}`, { method: "PATCH", json: { status: "paused" } });
    expect(forcedEdit.status).toBe(403);
    // Forced from the page itself too (same origin, the viewer's cookie).
    const fromPage = await viewer.page.evaluate(async (url) => (await fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ outcome: "ship", note: "Forced from the browser console." }) })).status, `/api/v1/campaigns/${campaign.id}/decisions`);
    expect(fromPage).toBe(403);
  });

  test("the lead records the decision: ship ends the campaign and the history lists it", { timeout: 90_000 }, async () => {
    const lead = await signedInBrowser(workspace.lead);
    const { page } = lead;
    await page.goto(`${appUrl}/campaigns/${campaign.id}`);
    const form = page.getByTestId("decision-form");
    await form.waitFor();
    await form.getByLabel(/^Ship/).check();
    await form.getByLabel("Note").fill("Lift proven in a week; ship the e-mail to every subscriber.");
    await form.getByRole("button", { name: "Record decision" }).click();
    await page.getByText("Ship recorded.").waitFor();
    await expect.poll(() => page.getByTestId("decision-history").innerText()).toContain("ship the e-mail to every subscriber");
    const read = await workspace.lead.client.json<CampaignDto>(`/api/v1/campaigns/${campaign.id}`);
    expect(read.body.status).toBe("ended");
    await expectAccessible(lead, "07-campaign-decided");

    await page.goto(`${appUrl}/campaigns`);
    await page.getByRole("table", { name: "Campaigns with their calls" }).waitFor();
    expect(await page.locator(`tr[data-campaign="${campaign.slug}"]`).innerText()).toContain("Lift proven");
    await expectAccessible(lead, "08-portfolio");

    await page.goto(`${appUrl}/planner`);
    await page.getByTestId("planner-fixed").waitFor({ timeout: 30_000 });
    await page.getByRole("table", { name: "Expected days to a call by true lift" }).waitFor();
    await expectAccessible(lead, "09-planner");
    expect(lead.errors).toEqual([]);
  });

  test("the campaign page on a phone and in dark mode; first-load JavaScript and time to a usable chart", { timeout: 90_000 }, async () => {
    const phone = await signedInBrowser(workspace.lead, { viewport: { width: 390, height: 844 } });
    await phone.page.goto(`${appUrl}/campaigns/${campaign.id}`);
    await phone.page.getByTestId("lift-chart").locator("svg.recharts-surface").first().waitFor();
    await expectAccessible(phone, "10-campaign-phone");
    const dark = await signedInBrowser(workspace.lead, { colorScheme: "dark" });
    await dark.page.goto(`${appUrl}/campaigns/${campaign.id}`);
    await dark.page.getByTestId("lift-chart").locator("svg.recharts-surface").first().waitFor();
    await expectAccessible(dark, "11-campaign-dark");

    const fresh = await signedInBrowser(workspace.lead);
    await fresh.page.goto(`${appUrl}/campaigns/${campaign.id}`, { waitUntil: "commit" });
    await fresh.page.waitForFunction(() => document.querySelector('[data-testid="lift-chart"] svg.recharts-surface path') !== null, undefined, { timeout: 30_000, polling: 10 });
    const usableMs = await fresh.page.evaluate(() => performance.now());
    await fresh.page.waitForLoadState("networkidle");
    const js = await fresh.page.evaluate(() =>
      performance
        .getEntriesByType("resource")
        .filter((entry) => (entry as PerformanceResourceTiming).initiatorType === "script" || entry.name.endsWith(".js"))
        .map((entry) => ({ name: entry.name, transferred: (entry as PerformanceResourceTiming).transferSize, decoded: (entry as PerformanceResourceTiming).decodedBodySize })),
    );
    const transferred = js.reduce((sum, entry) => sum + entry.transferred, 0);
    const decoded = js.reduce((sum, entry) => sum + entry.decoded, 0);
    writeFileSync(path.join(SCREENSHOT_DIR, "campaign-page-performance.json"), JSON.stringify({ usableMs, transferredJsBytes: transferred, decodedJsBytes: decoded, scripts: js.length }, null, 2));
    console.log(`[journeys] campaign page: lift chart drawn after ${usableMs.toFixed(0)} ms; ${js.length} scripts, ${(transferred / 1024).toFixed(1)} KiB transferred (${(decoded / 1024).toFixed(1)} KiB decoded)`);
    expect(usableMs).toBeLessThan(10_000);
  });
});
