import { describe, expect, it } from "vitest";
import { recomputeCampaign, runRecompute } from "@/cron/recompute";
import { getPool } from "@/db";
import { listAnalysisDays } from "@/db/queries/analysis";
import { AnalysisDaysCopyText } from "@/db/queries/recompute-batch";
import { conversionCounts, createBareWorkspace, createWorkerCampaign, putCounts } from "../helpers/worker-fixtures";

/** A stored day without its row id and timestamps. */
function storedNumbers(day: Awaited<ReturnType<typeof listAnalysisDays>>[number]) {
  const { id, createdAt, updatedAt, computedAt, ...numbers } = day;
  expect([id, createdAt, updatedAt, computedAt].every((value) => value !== null)).toBe(true);
  return numbers;
}

describe("the recompute pass in groups of campaigns", () => {
  it("recomputes every campaign of several groups, and a campaign whose analysis throws costs only itself", async () => {
    const workspaceId = await createBareWorkspace();
    const quiet = { holdout: { units: 1500, rate: 0.05 }, treatment: { units: 1500, rate: 0.05 } };
    const created = [];
    // 45 campaigns: two full groups and a part, with day counts that differ by campaign.
    for (let index = 0; index < 45; index += 1) {
      const campaign = await createWorkerCampaign({ workspaceId, createdBy: null });
      await putCounts(campaign, conversionCounts(2 + (index % 5), quiet));
      created.push({ campaign, days: 2 + (index % 5) });
    }
    const broken = created[23].campaign;
    // Without a holdout arm the engine refuses the plan (RangeError): that campaign fails alone.
    await getPool().query("update arms set key = 'control' where campaign_id = $1 and key = 'holdout'", [broken.id]);

    const pass = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(pass).toMatchObject({ ran: true, processed: 45, recomputed: 44, unchanged: 0, failed: 1 });
    expect(pass.campaigns.map((outcome) => outcome.campaignId).sort()).toEqual(
      created.map(({ campaign }) => campaign.id).filter((id) => id !== broken.id).sort(),
    );
    for (const { campaign, days } of created) {
      const stored = await listAnalysisDays(campaign.id);
      expect(stored.map((day) => day.daysRun)).toEqual(campaign.id === broken.id ? [] : Array.from({ length: days }, (_, day) => day + 1));
    }
    const { rows } = await getPool().query<{ id: string; analyzed: boolean }>(
      "select id, analyzed_at is not null as analyzed from campaigns where workspace_id = $1",
      [workspaceId],
    );
    expect(rows.filter((row) => !row.analyzed).map((row) => row.id)).toEqual([broken.id]);
    await expect(recomputeCampaign(broken.id)).rejects.toThrow(RangeError);

    // The group path stores what the one-campaign path stores.
    const sample = created[7].campaign;
    const grouped = (await listAnalysisDays(sample.id)).map(storedNumbers);
    await recomputeCampaign(sample.id, { force: true });
    const alone = (await listAnalysisDays(sample.id)).map(storedNumbers);
    expect(grouped).toEqual(alone);

    const again = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(again).toMatchObject({ processed: 1, recomputed: 0, failed: 1 });
  }, 120_000);

  it("writes COPY text with escaped backslashes, tabs and newlines, SQL null and infinite ends", () => {
    const text = new AnalysisDaysCopyText();
    text.append([
      {
        campaignId: "c0ffee00-0000-4000-8000-000000000000",
        day: "2026-03-02",
        daysRun: 2,
        call: "collecting",
        numbers: [0.5, null, -Infinity, Infinity, 1e-7, null, null, null, null, null, null, 0.0831],
        healthJson: '{"issues":[{"code":"x","message":"a\\\\b\tc\nd"}]}',
        detailJson: "{}",
        inputsHash: "ab12",
      },
    ]);
    const chunk = Buffer.concat(text.chunks()).toString("utf8");
    text.release();
    expect(chunk).toBe(
      "c0ffee00-0000-4000-8000-000000000000\t2026-03-02\t2\tcollecting\t0.5\t\\N\t-Infinity\tInfinity\t1e-7\t\\N\t\\N\t\\N\t\\N\t\\N\t\\N\t0.0831" +
        '\t{"issues":[{"code":"x","message":"a\\\\\\\\b\\tc\\nd"}]}\t{}\tab12\n',
    );
  });
});
