import { afterAll, describe, expect, inject, test } from "vitest";
import { getAlertRule } from "@/db/queries/alert-rules";
import { createWorkspaceWithRoles, type TestUser } from "../factories";
import { describeViolations, openBrowser, screenshot, seriousAxeViolations, type BrowserSession } from "../helpers/browser";

const appUrl = inject("appUrl");
const sessions: BrowserSession[] = [];
// The nav prefetches screens other issues build; until they exist their 404 is not this screen's error.
const IGNORE = [/Failed to load resource: the server responded with a status of 404/];

/** A browser signed in as the test user (the API session's cookies, copied over). */
async function signedInBrowser(user: TestUser): Promise<BrowserSession> {
  const session = await openBrowser({ ignoreConsole: IGNORE });
  sessions.push(session);
  await session.context.addCookies([...user.client.cookies].map(([name, value]) => ({ name, value, url: appUrl })));
  return session;
}

afterAll(async () => {
  await Promise.all(sessions.map((session) => session.close()));
});

describe("the alert rules screen in a real browser", () => {
  test("a lead reaches it from Settings, changes the rules and sees them saved; a viewer sees them read-only", { timeout: 120_000 }, async () => {
    const workspace = await createWorkspaceWithRoles("Northwind Outfitters");
    const { page, errors } = await signedInBrowser(workspace.lead);
    await page.goto(`${appUrl}/settings`);
    await page.getByRole("link", { name: "Alert rules" }).click();
    await page.getByRole("heading", { name: "Alert rules", level: 1 }).waitFor();
    expect(page.url()).toBe(`${appUrl}/settings/alerts`);

    // Defaults: every call alerts, admins and leads receive them, no digest.
    expect(await page.getByRole("checkbox", { name: /Horizon reached/ }).isChecked()).toBe(true);
    expect(await page.getByRole("checkbox", { name: /Admins/ }).isChecked()).toBe(true);
    expect(await page.getByRole("checkbox", { name: /Viewers/ }).isChecked()).toBe(false);
    expect(await page.getByRole("checkbox", { name: /Daily digest/ }).isChecked()).toBe(false);

    await page.getByRole("checkbox", { name: /Horizon reached/ }).uncheck();
    await page.getByRole("checkbox", { name: /Collecting evidence/ }).uncheck();
    await page.getByRole("checkbox", { name: /Admins/ }).uncheck();
    await page.getByLabel("Extra addresses").fill("not-an-address");
    await page.getByRole("button", { name: "Save alert rules" }).click();
    await page.getByText("Error: Not an e-mail address: not-an-address").waitFor();
    await screenshot(page, "alert-rules-error");

    await page.getByLabel("Extra addresses").fill("growth-alerts@northwind-outfitters.example");
    await page.getByRole("checkbox", { name: /Daily digest/ }).check();
    await page.getByRole("button", { name: "Save alert rules" }).click();
    await page.getByRole("status").filter({ hasText: "Saved." }).waitFor();
    await screenshot(page, "alert-rules-saved");
    expect(await getAlertRule(workspace.id)).toEqual({
      workspaceId: workspace.id,
      calls: ["lift", "harm", "flat", "suspect"],
      defaultRecipientRoles: ["lead"],
      extraRecipients: ["growth-alerts@northwind-outfitters.example"],
      dailyDigest: true,
    });

    await page.reload();
    await page.getByRole("heading", { name: "Alert rules", level: 1 }).waitFor();
    expect(await page.getByRole("checkbox", { name: /Horizon reached/ }).isChecked()).toBe(false);
    expect(await page.getByRole("checkbox", { name: /Leads/ }).isChecked()).toBe(true);
    expect(await page.getByLabel("Extra addresses").inputValue()).toBe("growth-alerts@northwind-outfitters.example");
    const violations = await seriousAxeViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    expect(errors).toEqual([]);

    const viewer = await signedInBrowser(workspace.viewer);
    await viewer.page.goto(`${appUrl}/settings/alerts`);
    await viewer.page.getByRole("heading", { name: "Alert rules", level: 1 }).waitFor();
    await viewer.page.getByText("Note: Read only").waitFor();
    expect(await viewer.page.getByRole("button", { name: "Save alert rules" }).count()).toBe(0);
    expect(await viewer.page.getByRole("checkbox").count()).toBe(0);
    const rules = await viewer.page.getByRole("definition").allInnerTexts();
    expect(rules).toEqual(["Lift proven, Harm proven, Not worth waiting, Check the data", "Leads", "growth-alerts@northwind-outfitters.example", "On"]);
    await screenshot(viewer.page, "alert-rules-read-only");
    const viewerViolations = await seriousAxeViolations(viewer.page);
    expect(viewerViolations, describeViolations(viewerViolations)).toEqual([]);
    expect(viewer.errors).toEqual([]);
  });
});
