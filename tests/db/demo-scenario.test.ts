import { describe, expect, it } from "vitest";
import { runRecompute } from "@/cron/recompute";
import { DEMO_CAMPAIGNS, generateDemoRows, seedDemoCampaigns } from "@/db/demo-scenario";
import { listPortfolio } from "@/db/queries/portfolio";
import { createWorkspaceWithRoles } from "../factories";
import { dumpProductTables } from "../factories-campaigns";

describe("the demo scenario", () => {
  it("generates the same counts for the same seed and other counts for another", () => {
    const spec = DEMO_CAMPAIGNS[0];
    expect(generateDemoRows(spec, "2026-03-01", 1)).toEqual(generateDemoRows(spec, "2026-03-01", 1));
    expect(generateDemoRows(spec, "2026-03-01", 2)).not.toEqual(generateDemoRows(spec, "2026-03-01", 1));
    expect(generateDemoRows(spec, "2026-03-01", 1)).toHaveLength(spec.daysOfData * spec.arms.length);
  });

  it("seeds one campaign per situation through ingest, is idempotent, and the worker reaches the intended calls", { timeout: 120_000 }, async () => {
    const workspace = await createWorkspaceWithRoles("Northwind Outfitters");
    const options = { createdBy: workspace.marketer.id, adminUserId: workspace.admin.id, timeZone: "Europe/Berlin" };
    const first = await seedDemoCampaigns(workspace.id, options);
    expect(first.filter((entry) => entry.created)).toHaveLength(DEMO_CAMPAIGNS.length);
    const summary = await runRecompute({ workspaceIds: [workspace.id], wait: true });
    expect(summary.alerts).toBeGreaterThanOrEqual(1);
    const before = await dumpProductTables([workspace.id]);
    const second = await seedDemoCampaigns(workspace.id, options);
    expect(second.every((entry) => !entry.created)).toBe(true);
    expect(await dumpProductTables([workspace.id])).toBe(before);

    const portfolio = await listPortfolio(workspace.id);
    const callOf = (slug: string) => portfolio.find((row) => row.slug === slug)?.call;
    expect(callOf("trail-shoe-spring-e-mail")).toBe("lift");
    expect(callOf("winter-jacket-push-nudge")).toBe("harm");
    expect(callOf("free-shipping-banner")).toBe("flat");
    expect(callOf("tent-weekend-promo-order-value")).toBe("collecting");
    expect(callOf("headlamp-bundle-onboarding")).toBe("suspect");
    expect(portfolio.every((row) => row.status === "running" && (row.daysRun ?? 0) >= 21 && (row.daysRun ?? 0) <= 56)).toBe(true);
    expect(portfolio.find((row) => row.slug === "tent-weekend-promo-order-value")?.metricKind).toBe("mean");
  });
});
