import { randomUUID } from "node:crypto";
import pino from "pino";
import { describe, expect, it } from "vitest";
import { recomputeCampaign, runRecompute } from "@/cron/recompute";
import { getPool } from "@/db";
import { listAnalysisDays } from "@/db/queries/analysis";
import { ingestBatch } from "@/lib/ingest/ingest-batch";
import { conversionCounts, createBareWorkspace, createWorkerCampaign, marchDay, putCounts } from "../helpers/worker-fixtures";

async function waitFor(predicate: () => boolean | Promise<boolean>, timeoutMs = 20_000) {
  const deadline = Date.now() + timeoutMs;
  while (!(await predicate())) {
    if (Date.now() > deadline) throw new Error("condition not met in time");
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

/** A logger whose lines the test can read. */
function capturingLogger() {
  const lines: { msg?: string; campaignId?: string }[] = [];
  const logger = pino({ level: "info" }, { write: (line: string) => void lines.push(JSON.parse(line)) });
  return { logger, lines };
}

describe("an ingest in flight during a recompute", () => {
  it("is picked up by the next runRecompute(), not only by the nightly pass", async () => {
    const workspaceId = await createBareWorkspace();
    const campaign = await createWorkerCampaign({ workspaceId, createdBy: null });
    const quiet = { holdout: { units: 2000, rate: 0.05 }, treatment: { units: 2000, rate: 0.05 } };
    await putCounts(campaign, conversionCounts(2, quiet));
    expect((await recomputeCampaign(campaign.id)).days).toBe(2);
    // A third day arrives; the recompute below picks it up while a fourth day is being ingested.
    await putCounts(campaign, conversionCounts(1, quiet, 2));

    // Park the ingest inside its transaction: it has begun (its now() is taken) but waits on the
    // idempotency key's advisory lock, which this connection holds.
    const idempotencyKey = randomUUID();
    const gate = await getPool().connect();
    const events: string[] = [];
    try {
      await gate.query("select pg_advisory_lock(hashtextextended($1, 0))", [`ingest:${workspaceId}:${idempotencyKey}`]);
      const [{ pid }] = (await gate.query<{ pid: number }>("select pg_backend_pid() as pid")).rows;
      const ingest = ingestBatch({
        workspaceId,
        source: "api",
        idempotencyKey,
        rows: [
          { campaign: campaign.id, arm: "holdout", date: marchDay(3), units: 2000, conversions: 100 },
          { campaign: campaign.id, arm: "treatment", date: marchDay(3), units: 2000, conversions: 101 },
        ],
      }).then((outcome) => {
        events.push("ingest committed");
        return outcome;
      });
      await waitFor(async () => (await gate.query("select 1 from pg_stat_activity where $1 = any(pg_blocking_pids(pid))", [pid])).rowCount! > 0);

      // Recompute while the ingest is in flight: it reads the inputs without the new day, stamps
      // analyzed_at and holds its transaction open (the RECOMPUTE_HOLD_MS hook).
      const { logger, lines } = capturingLogger();
      const recompute = recomputeCampaign(campaign.id, { holdMs: 1_500, logger }).then((result) => {
        events.push("recompute committed");
        return result;
      });
      await waitFor(() => lines.some((line) => line.msg === "holding the recompute transaction open before commit" && line.campaignId === campaign.id));
      await gate.query("select pg_advisory_unlock(hashtextextended($1, 0))", [`ingest:${workspaceId}:${idempotencyKey}`]);

      const [held, ingested] = await Promise.all([recompute, ingest]);
      expect(held).toMatchObject({ recomputed: true, days: 3 });
      expect(ingested.body).toMatchObject({ accepted: 2, replaced: 0 });
      // The ingest waited for the recompute's row lock before writing.
      expect(events).toEqual(["recompute committed", "ingest committed"]);
    } finally {
      gate.release();
    }

    const next = await runRecompute({ wait: true, workspaceIds: [workspaceId] });
    expect(next.campaigns.find((c) => c.campaignId === campaign.id)).toMatchObject({ recomputed: true, days: 4 });
    expect((await listAnalysisDays(campaign.id)).map((day) => day.day)).toEqual([0, 1, 2, 3].map(marchDay));
  });
});
