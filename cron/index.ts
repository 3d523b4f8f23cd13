/**
 * The Peeksafe worker: `tsx cron/index.ts` schedules the jobs with node-cron; `--once` runs them
 * one time and exits (`--job recompute|nightly|mailer|digest`, repeatable; default recompute and mailer).
 * Schedules come from RECOMPUTE_CRON, NIGHTLY_CRON, MAILER_CRON and DIGEST_CRON (see cron/config.ts).
 */
import { parseArgs } from "node:util";
import { schedule, type ScheduledTask } from "node-cron";
import { closeDb } from "@/db";
import { listWorkspaceTimeZones } from "@/db/queries/analysis";
import { createLogger } from "@/lib/logger";
import { getWorkerEnv } from "./config";
import { runDigest } from "./digest";
import { runMailer } from "./mailer";
import { runRecompute } from "./recompute";

const JOBS = ["recompute", "nightly", "mailer", "digest"] as const;
type Job = (typeof JOBS)[number];

const logger = createLogger("worker");

async function runJob(job: Job, workspaceIds?: string[]): Promise<void> {
  switch (job) {
    case "recompute": {
      const summary = await runRecompute({ logger: createLogger("recompute") });
      if (summary.alerts > 0) await runMailer({ logger: createLogger("mailer") });
      return;
    }
    case "nightly": {
      const summary = await runRecompute({ all: true, workspaceIds, logger: createLogger("recompute") });
      if (summary.alerts > 0) await runMailer({ logger: createLogger("mailer") });
      return;
    }
    case "mailer":
      await runMailer({ logger: createLogger("mailer") });
      return;
    case "digest":
      await runDigest({ workspaceIds, logger: createLogger("digest") });
      return;
  }
}

async function guarded(job: Job, workspaceIds?: string[]): Promise<void> {
  try {
    await runJob(job, workspaceIds);
  } catch (error) {
    logger.error({ job, err: error }, "job failed; the next run tries again");
  }
}

async function runOnce(jobs: Job[]): Promise<number> {
  let failed = false;
  for (const job of jobs) {
    try {
      await runJob(job);
    } catch (error) {
      failed = true;
      logger.error({ job, err: error }, "job failed");
    }
  }
  return failed ? 1 : 0;
}

async function runScheduled(): Promise<void> {
  const env = getWorkerEnv();
  const tasks: ScheduledTask[] = [];
  tasks.push(schedule(env.RECOMPUTE_CRON, () => guarded("recompute"), { name: "recompute", noOverlap: true }));
  tasks.push(schedule(env.MAILER_CRON, () => guarded("mailer"), { name: "mailer", noOverlap: true }));
  const zoned = new Map<string, ScheduledTask[]>();
  const scheduleZones = async () => {
    for (const [timeZone] of await listWorkspaceTimeZones()) {
      if (zoned.has(timeZone)) continue;
      const byZone = async () => (await listWorkspaceTimeZones()).get(timeZone) ?? [];
      try {
        zoned.set(timeZone, [
          schedule(env.NIGHTLY_CRON, async () => guarded("nightly", await byZone()), { name: `nightly ${timeZone}`, timezone: timeZone, noOverlap: true }),
          schedule(env.DIGEST_CRON, async () => guarded("digest", await byZone()), { name: `digest ${timeZone}`, timezone: timeZone, noOverlap: true }),
        ]);
        logger.info({ timeZone, nightly: env.NIGHTLY_CRON, digest: env.DIGEST_CRON }, "scheduled the nightly pass and digest for a time zone");
      } catch (error) {
        logger.error({ timeZone, err: error }, "cannot schedule for this time zone");
        zoned.set(timeZone, []);
      }
    }
  };
  await scheduleZones();
  tasks.push(schedule("7 * * * *", () => scheduleZones().catch((error) => logger.error({ err: error }, "cannot list time zones")), { name: "time zones", noOverlap: true }));
  logger.info({ recompute: env.RECOMPUTE_CRON, mailer: env.MAILER_CRON }, "worker started");
  await guarded("recompute");

  const stop = async (signal: string) => {
    logger.info({ signal }, "worker stopping");
    for (const task of [...tasks, ...[...zoned.values()].flat()]) await task.stop();
    await closeDb();
    process.exit(0);
  };
  process.once("SIGINT", () => void stop("SIGINT"));
  process.once("SIGTERM", () => void stop("SIGTERM"));
}

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { once: { type: "boolean", default: false }, job: { type: "string", multiple: true } }, strict: true });
  const jobs = (values.job ?? ["recompute", "mailer"]).map((job) => {
    if (!(JOBS as readonly string[]).includes(job)) throw new Error(`unknown job "${job}"; choose from ${JOBS.join(", ")}`);
    return job as Job;
  });
  if (values.once) {
    const code = await runOnce(jobs);
    await closeDb();
    process.exitCode = code;
    return;
  }
  await runScheduled();
}

main().catch(async (error) => {
  logger.fatal({ err: error }, "worker cannot start");
  await closeDb().catch(() => undefined);
  process.exitCode = 1;
});
